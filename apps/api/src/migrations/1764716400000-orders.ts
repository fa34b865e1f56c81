import type { MigrationInterface, QueryRunner } from "typeorm";

/** Orders with their snapshot, the double-entry ledger, and provider events handled once. */
export class Orders1764716400000 implements MigrationInterface {
  name = "Orders1764716400000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `ledger_entry` (`id` bigint NOT NULL AUTO_INCREMENT, `order_id` char(36) NULL, `account` varchar(60) NOT NULL, `amount_minor` bigint NOT NULL, `currency` char(3) NOT NULL, `kind` varchar(20) NOT NULL, `provider_event_id` varchar(80) NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `idx_ledger_account` (`account`, `created_at`), INDEX `idx_ledger_order` (`order_id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `buyer_order` (`id` char(36) NOT NULL, `buyer_id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `status` varchar(20) NOT NULL, `title` varchar(120) NOT NULL, `slab_snapshot` text NOT NULL, `currency` char(3) NOT NULL, `price_minor` bigint NOT NULL, `platform_fee_minor` bigint NOT NULL, `processing_fee_minor` bigint NOT NULL, `sawyer_net_minor` bigint NOT NULL, `tax_minor` bigint NOT NULL, `total_minor` bigint NOT NULL, `handover` varchar(8) NOT NULL, `delivery_address` text NULL, `checkout_session_id` varchar(80) NULL, `checkout_url` varchar(400) NULL, `payment_intent_id` varchar(80) NULL, `reserved_until` datetime(3) NOT NULL, `paid_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), INDEX `idx_buyer_order_status` (`status`, `reserved_until`), INDEX `idx_buyer_order_listing` (`listing_id`), INDEX `idx_buyer_order_sawyer` (`sawyer_id`, `created_at`), INDEX `idx_buyer_order_buyer` (`buyer_id`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `payment_event` (`id` varchar(80) NOT NULL, `type` varchar(60) NOT NULL, `payload` text NOT NULL, `received_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `payment_event`");
    await queryRunner.query("DROP TABLE `buyer_order`");
    await queryRunner.query("DROP TABLE `ledger_entry`");
  }
}

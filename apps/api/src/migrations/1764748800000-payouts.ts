import type { MigrationInterface, QueryRunner } from "typeorm";

/** Paying sawyers: payout accounts at the provider, payouts with the orders they cover, dispute refunds. */
export class Payouts1764748800000 implements MigrationInterface {
  name = "Payouts1764748800000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `payout_account` (`sawyer_id` char(36) NOT NULL, `provider_account_id` varchar(80) NOT NULL, `payouts_enabled` tinyint NOT NULL DEFAULT 0, `details_submitted` tinyint NOT NULL DEFAULT 0, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), UNIQUE INDEX `IDX_90cd5c08972b85f41df0b10c2b` (`provider_account_id`), PRIMARY KEY (`sawyer_id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `payout` (`id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `currency` char(3) NOT NULL, `amount_minor` bigint NOT NULL, `status` varchar(12) NOT NULL, `due_key` varchar(100) NOT NULL, `attempt` smallint NOT NULL, `transfer_id` varchar(80) NULL, `failure_reason` varchar(500) NULL, `approved_by` char(36) NULL, `created_at` datetime(3) NOT NULL, `sent_at` datetime(3) NULL, INDEX `idx_payout_status` (`status`, `created_at`), INDEX `idx_payout_sawyer` (`sawyer_id`, `created_at`), UNIQUE INDEX `idx_payout_due_attempt` (`due_key`, `attempt`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `payout_line` (`payout_id` char(36) NOT NULL, `order_id` char(36) NOT NULL, `amount_minor` bigint NOT NULL, INDEX `idx_payout_line_order` (`order_id`), PRIMARY KEY (`payout_id`, `order_id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `order_refund` (`id` char(36) NOT NULL, `order_id` char(36) NOT NULL, `amount_minor` bigint NOT NULL, `reason` varchar(1000) NOT NULL, `provider_refund_id` varchar(80) NULL, `created_by` char(36) NOT NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_order_refund_order` (`order_id`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `order_refund`");
    await queryRunner.query("DROP TABLE `payout_line`");
    await queryRunner.query("DROP TABLE `payout`");
    await queryRunner.query("DROP TABLE `payout_account`");
  }
}

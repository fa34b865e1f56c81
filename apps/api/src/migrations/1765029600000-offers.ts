import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Offers on listings (`listing_offer`: the buyer's amount, the sawyer's counter, the agreed price
 * and the order it made), and each listing's offer settings: whether offers are welcome (off for
 * every existing listing) and the floor below which they are declined at once.
 */
export class Offers1765029600000 implements MigrationInterface {
  name = "Offers1765029600000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `listing_offer` (`id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `buyer_id` char(36) NOT NULL, " +
        "`sawyer_id` char(36) NOT NULL, `status` varchar(12) NOT NULL, `decline_reason` varchar(24) NULL, `currency` char(3) NOT NULL, " +
        "`amount_minor` bigint NOT NULL, `counter_minor` bigint NULL, `agreed_minor` bigint NULL, `round` int NOT NULL, " +
        "`steps` text NOT NULL, `handover` varchar(8) NOT NULL, `delivery_address` text NULL, `expires_at` datetime(3) NULL, " +
        "`order_id` char(36) NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), " +
        "`updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), " +
        "INDEX `idx_listing_offer_expiry` (`status`, `expires_at`), INDEX `idx_listing_offer_sawyer` (`sawyer_id`, `created_at`), " +
        "INDEX `idx_listing_offer_buyer` (`buyer_id`, `created_at`), INDEX `idx_listing_offer_listing` (`listing_id`, `status`), " +
        "PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query("ALTER TABLE `listing` ADD `offers_welcome` tinyint NOT NULL DEFAULT 0");
    await queryRunner.query("ALTER TABLE `listing` ADD `offer_floor_minor` bigint NULL");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `listing` DROP COLUMN `offer_floor_minor`");
    await queryRunner.query("ALTER TABLE `listing` DROP COLUMN `offers_welcome`");
    await queryRunner.query("DROP TABLE `listing_offer`");
  }
}

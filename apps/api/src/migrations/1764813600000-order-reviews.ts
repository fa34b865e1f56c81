import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Reviews of completed orders (`order_review`: one per order, the sawyer's one answer, an admin's
 * hiding), and each catalogue row's copy of its yard's visible reviews (count and sum of ratings)
 * for the rating on catalogue cards. Existing catalogue rows start at no reviews: there were none.
 */
export class OrderReviews1764813600000 implements MigrationInterface {
  name = "OrderReviews1764813600000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `order_review` (`id` char(36) NOT NULL, `order_id` char(36) NOT NULL, `buyer_id` char(36) NOT NULL, " +
        "`sawyer_id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `rating` tinyint NOT NULL, `matched_listing` tinyint NOT NULL, " +
        "`matched_listing_comment` text NOT NULL, `handover_went_well` tinyint NOT NULL, `handover_comment` text NOT NULL, " +
        "`body` text NOT NULL, `created_at` datetime(3) NOT NULL, `edited_at` datetime(3) NULL, `answer` text NULL, " +
        "`answered_at` datetime(3) NULL, `hidden_at` datetime(3) NULL, `hidden_by` char(36) NULL, `hidden_reason` text NULL, " +
        "INDEX `idx_order_review_newest` (`created_at`), INDEX `idx_order_review_yard` (`sawyer_id`, `hidden_at`, `created_at`), " +
        "UNIQUE INDEX `uq_order_review_order` (`order_id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query("ALTER TABLE `catalogue_entry` ADD `yard_review_count` int UNSIGNED NOT NULL DEFAULT '0'");
    await queryRunner.query("ALTER TABLE `catalogue_entry` ADD `yard_rating_total` int UNSIGNED NOT NULL DEFAULT '0'");
    await queryRunner.query(
      "ALTER TABLE `order_review` ADD CONSTRAINT `FK_25fd11b7721c7b47ba830fe4e74` FOREIGN KEY (`order_id`) REFERENCES `buyer_order`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `order_review` DROP FOREIGN KEY `FK_25fd11b7721c7b47ba830fe4e74`");
    await queryRunner.query("ALTER TABLE `catalogue_entry` DROP COLUMN `yard_rating_total`");
    await queryRunner.query("ALTER TABLE `catalogue_entry` DROP COLUMN `yard_review_count`");
    await queryRunner.query("DROP TABLE `order_review`");
  }
}

import type { MigrationInterface, QueryRunner } from "typeorm";

/** Operator desk: review decisions with snapshots, the audit log, reports, settings, account suspension. */
export class OperatorDesk1764738000000 implements MigrationInterface {
  name = "OperatorDesk1764738000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `audit_entry` (`id` bigint NOT NULL AUTO_INCREMENT, `actor_id` char(36) NULL, `actor_label` varchar(254) NOT NULL, `action` varchar(60) NOT NULL, `target_kind` varchar(30) NOT NULL, `target_id` varchar(64) NOT NULL, `before_json` text NULL, `after_json` text NULL, `reason` text NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_audit_entry_target` (`target_id`, `id`), INDEX `idx_audit_entry_action` (`action`, `id`), INDEX `idx_audit_entry_actor` (`actor_id`, `id`), INDEX `idx_audit_entry_created` (`created_at`, `id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `content_report` (`id` char(36) NOT NULL, `reporter_id` char(36) NOT NULL, `target_kind` varchar(12) NOT NULL, `target_id` varchar(36) NOT NULL, `listing_id` char(36) NULL, `reported_account_id` char(36) NOT NULL, `reason` text NOT NULL, `status` varchar(20) NOT NULL, `resolved_by` char(36) NULL, `resolution_note` text NULL, `resolved_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_content_report_target` (`target_kind`, `target_id`), INDEX `idx_content_report_status` (`status`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `listing_review` (`id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `reviewer_id` char(36) NOT NULL, `decision` varchar(12) NOT NULL, `reason` text NULL, `snapshot` text NOT NULL, `submitted_at` datetime(3) NOT NULL, `reviewed_at` datetime(3) NOT NULL, INDEX `idx_listing_review_reviewed` (`reviewed_at`), INDEX `idx_listing_review_listing` (`listing_id`, `reviewed_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `marketplace_setting` (`setting_key` varchar(60) NOT NULL, `value` text NOT NULL, `updated_by` char(36) NULL, `updated_at` datetime(3) NOT NULL, PRIMARY KEY (`setting_key`)) ENGINE=InnoDB",
    );
    await queryRunner.query("ALTER TABLE `account` ADD `suspended_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `account` ADD `suspension_reason` text NULL");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `suspension_reason`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `suspended_at`");
    await queryRunner.query("DROP TABLE `marketplace_setting`");
    await queryRunner.query("DROP TABLE `listing_review`");
    await queryRunner.query("DROP TABLE `content_report`");
    await queryRunner.query("DROP TABLE `audit_entry`");
  }
}

import type { MigrationInterface, QueryRunner } from "typeorm";

/** The e-mail outbox: rows written with the change that causes them, delivered (with retries) by a job. */
export class EmailOutbox1764997200000 implements MigrationInterface {
  name = "EmailOutbox1764997200000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `outbox_email` (`id` bigint NOT NULL AUTO_INCREMENT, `kind` varchar(40) NOT NULL, `recipient` varchar(254) NOT NULL, `subject` varchar(300) NOT NULL, `text_body` mediumtext NOT NULL, `html_body` mediumtext NULL, `status` varchar(10) NOT NULL, `attempts` int NOT NULL DEFAULT '0', `next_attempt_at` datetime(3) NOT NULL, `claimed_by` varchar(80) NULL, `last_error` varchar(300) NULL, `sent_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `idx_outbox_email_due` (`status`, `next_attempt_at`, `id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `outbox_email`");
  }
}

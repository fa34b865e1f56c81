import type { MigrationInterface, QueryRunner } from "typeorm";

/** The second factor: the account's TOTP secret (and a set-up's pending one), the last accepted time step, hashed recovery codes. */
export class SecondFactor1765008000000 implements MigrationInterface {
  name = "SecondFactor1765008000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `account` ADD `totp_secret` varchar(64) NULL");
    await queryRunner.query("ALTER TABLE `account` ADD `totp_pending_secret` varchar(64) NULL");
    await queryRunner.query("ALTER TABLE `account` ADD `totp_on_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `account` ADD `totp_last_step` int NULL");
    await queryRunner.query(
      "CREATE TABLE `recovery_code` (`id` bigint NOT NULL AUTO_INCREMENT, `account_id` char(36) NOT NULL, `code_hash` varchar(100) NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `used_at` datetime(3) NULL, INDEX `idx_recovery_code_account` (`account_id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "ALTER TABLE `recovery_code` ADD CONSTRAINT `FK_9db6a6c505946232618e26c79e8` FOREIGN KEY (`account_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `recovery_code` DROP FOREIGN KEY `FK_9db6a6c505946232618e26c79e8`");
    await queryRunner.query("DROP TABLE `recovery_code`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `totp_last_step`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `totp_on_at`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `totp_pending_secret`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `totp_secret`");
  }
}

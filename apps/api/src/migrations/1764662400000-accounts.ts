import type { MigrationInterface, QueryRunner } from "typeorm";

/** Accounts, signed-in sessions and single-use e-mail tokens. */
export class Accounts1764662400000 implements MigrationInterface {
  name = "Accounts1764662400000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `account` (`id` char(36) NOT NULL, `email` varchar(254) NOT NULL, `password_hash` varchar(100) NOT NULL, `role` varchar(16) NOT NULL, `display_name` varchar(80) NOT NULL, `yard_name` varchar(80) NULL, `pickup_town` varchar(80) NULL, `email_verified_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), UNIQUE INDEX `IDX_4c8f96ccf523e9a3faefd5bdd4` (`email`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `email_token` (`id` bigint NOT NULL AUTO_INCREMENT, `account_id` char(36) NOT NULL, `purpose` varchar(20) NOT NULL, `token_hash` char(64) NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `expires_at` datetime(3) NOT NULL, `used_at` datetime(3) NULL, INDEX `idx_email_token_account` (`account_id`, `purpose`), UNIQUE INDEX `IDX_7de8158f2f29aba7331b957693` (`token_hash`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `session_record` (`key_hash` char(64) NOT NULL, `account_id` char(36) NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `expires_at` datetime(3) NOT NULL, `revoked_at` datetime(3) NULL, INDEX `idx_session_record_account` (`account_id`), PRIMARY KEY (`key_hash`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "ALTER TABLE `email_token` ADD CONSTRAINT `FK_d94b8e681a98ecaf2c6bfd81255` FOREIGN KEY (`account_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `session_record` ADD CONSTRAINT `FK_843a15d4c1bc0fcc000ddd57d8c` FOREIGN KEY (`account_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `session_record` DROP FOREIGN KEY `FK_843a15d4c1bc0fcc000ddd57d8c`");
    await queryRunner.query("ALTER TABLE `email_token` DROP FOREIGN KEY `FK_d94b8e681a98ecaf2c6bfd81255`");
    await queryRunner.query("DROP TABLE `session_record`");
    await queryRunner.query("DROP TABLE `email_token`");
    await queryRunner.query("DROP TABLE `account`");
  }
}

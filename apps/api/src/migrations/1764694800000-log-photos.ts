import type { MigrationInterface, QueryRunner } from "typeorm";

/** Photos of logs (the tree as felled, the cut ends), through the same pipeline as listing photos. */
export class LogPhotos1764694800000 implements MigrationInterface {
  name = "LogPhotos1764694800000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `log_photo` (`id` char(36) NOT NULL, `log_id` char(36) NOT NULL, `position` smallint NOT NULL, `alt_text` varchar(300) NOT NULL, `width` int NOT NULL, `height` int NOT NULL, `original_format` varchar(8) NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `idx_log_photo_log` (`log_id`, `position`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "ALTER TABLE `log_photo` ADD CONSTRAINT `FK_deddd7103181e65ad2b276ca054` FOREIGN KEY (`log_id`) REFERENCES `yard_log`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `log_photo` DROP FOREIGN KEY `FK_deddd7103181e65ad2b276ca054`");
    await queryRunner.query("DROP TABLE `log_photo`");
  }
}

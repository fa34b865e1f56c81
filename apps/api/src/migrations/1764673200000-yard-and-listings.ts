import type { MigrationInterface, QueryRunner } from "typeorm";

/** The sawyer's yard: logs, slabs, moisture readings; listings with their slabs and photos. */
export class YardAndListings1764673200000 implements MigrationInterface {
  name = "YardAndListings1764673200000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `listing` (`id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `title` varchar(120) NOT NULL, `description` text NOT NULL, `set_kind` varchar(12) NOT NULL, `price_mode` varchar(16) NOT NULL, `rate_minor` int NOT NULL, `currency` char(3) NOT NULL, `pickup` tinyint NOT NULL, `freight` tinyint NOT NULL, `status` varchar(12) NOT NULL, `review_note` text NULL, `board_feet` double NOT NULL, `volume_m3` double NOT NULL, `weight_kg` double NOT NULL, `weight_low_kg` double NOT NULL, `weight_high_kg` double NOT NULL, `price_minor` bigint NOT NULL, `platform_fee_minor` bigint NOT NULL, `processing_fee_minor` bigint NOT NULL, `sawyer_net_minor` bigint NOT NULL, `submitted_at` datetime(3) NULL, `published_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), INDEX `idx_listing_status` (`status`, `submitted_at`), INDEX `idx_listing_sawyer` (`sawyer_id`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `listing_photo` (`id` char(36) NOT NULL, `listing_id` char(36) NOT NULL, `position` smallint NOT NULL, `alt_text` varchar(300) NOT NULL, `width` int NOT NULL, `height` int NOT NULL, `original_format` varchar(8) NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `idx_listing_photo_listing` (`listing_id`, `position`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `yard_log` (`id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `species_slug` varchar(64) NOT NULL, `site_town` varchar(80) NOT NULL, `site_neighbourhood` varchar(80) NOT NULL DEFAULT '', `site_kind` varchar(20) NOT NULL, `felling_reason` varchar(20) NOT NULL, `felled_on` date NULL, `milled_on` date NULL, `length_mm` int NULL, `diameter_mm` int NULL, `notes` text NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), INDEX `idx_yard_log_sawyer` (`sawyer_id`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `slab` (`id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `log_id` char(36) NULL, `sequence_in_log` smallint NULL, `species_slug` varchar(64) NOT NULL, `length_mm` int NOT NULL, `thickness_mm` int NOT NULL, `width_stations_mm` text NOT NULL, `live_edge` varchar(8) NOT NULL, `surfacing` varchar(16) NOT NULL, `features` text NOT NULL, `defects` text NOT NULL, `drying_method` varchar(16) NOT NULL, `kiln_completed_on` date NULL, `heat_treated` tinyint NOT NULL DEFAULT 0, `heat_treatment_temperature_c` double NULL, `heat_treatment_minutes` int NULL, `notes` text NOT NULL, `area_m2` double NOT NULL, `volume_m3` double NOT NULL, `board_feet` double NOT NULL, `average_width_mm` double NOT NULL, `min_width_mm` int NOT NULL, `max_width_mm` int NOT NULL, `weight_kg` double NOT NULL, `weight_low_kg` double NOT NULL, `weight_high_kg` double NOT NULL, `weight_at_moisture_pct` double NOT NULL, `last_moisture_pct` double NULL, `last_read_on` date NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), `updated_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3) ON UPDATE CURRENT_TIMESTAMP(3), INDEX `idx_slab_log` (`log_id`, `sequence_in_log`), INDEX `idx_slab_sawyer` (`sawyer_id`, `created_at`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `listing_slab` (`listing_id` char(36) NOT NULL, `slab_id` char(36) NOT NULL, `position` smallint NOT NULL, INDEX `idx_listing_slab_slab` (`slab_id`), PRIMARY KEY (`listing_id`, `slab_id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE TABLE `moisture_reading` (`id` char(36) NOT NULL, `slab_id` char(36) NOT NULL, `read_on` date NOT NULL, `moisture_content_pct` double NOT NULL, `method` varchar(16) NOT NULL, `created_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), INDEX `idx_moisture_reading_slab` (`slab_id`, `read_on`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "ALTER TABLE `listing` ADD CONSTRAINT `FK_cbdcfa3f43060d8128de2feb1d2` FOREIGN KEY (`sawyer_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `listing_photo` ADD CONSTRAINT `FK_042408bd0ce9746ad2fa88dc0a3` FOREIGN KEY (`listing_id`) REFERENCES `listing`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `yard_log` ADD CONSTRAINT `FK_cc059a11e0984007f81365ac71a` FOREIGN KEY (`sawyer_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `slab` ADD CONSTRAINT `FK_bebf8917f4860a113c68759e1ca` FOREIGN KEY (`sawyer_id`) REFERENCES `account`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `slab` ADD CONSTRAINT `FK_fedc50d97493ceaaa702f606db6` FOREIGN KEY (`log_id`) REFERENCES `yard_log`(`id`) ON DELETE SET NULL ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `listing_slab` ADD CONSTRAINT `FK_9afc8d3fa58e65bb70a21e98670` FOREIGN KEY (`listing_id`) REFERENCES `listing`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `listing_slab` ADD CONSTRAINT `FK_a3b3ea87e7ba60b8a71b13cb33f` FOREIGN KEY (`slab_id`) REFERENCES `slab`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
    await queryRunner.query(
      "ALTER TABLE `moisture_reading` ADD CONSTRAINT `FK_86bdd6a12a2486b62dda5a45f51` FOREIGN KEY (`slab_id`) REFERENCES `slab`(`id`) ON DELETE CASCADE ON UPDATE NO ACTION",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `moisture_reading` DROP FOREIGN KEY `FK_86bdd6a12a2486b62dda5a45f51`");
    await queryRunner.query("ALTER TABLE `listing_slab` DROP FOREIGN KEY `FK_a3b3ea87e7ba60b8a71b13cb33f`");
    await queryRunner.query("ALTER TABLE `listing_slab` DROP FOREIGN KEY `FK_9afc8d3fa58e65bb70a21e98670`");
    await queryRunner.query("ALTER TABLE `slab` DROP FOREIGN KEY `FK_fedc50d97493ceaaa702f606db6`");
    await queryRunner.query("ALTER TABLE `slab` DROP FOREIGN KEY `FK_bebf8917f4860a113c68759e1ca`");
    await queryRunner.query("ALTER TABLE `yard_log` DROP FOREIGN KEY `FK_cc059a11e0984007f81365ac71a`");
    await queryRunner.query("ALTER TABLE `listing_photo` DROP FOREIGN KEY `FK_042408bd0ce9746ad2fa88dc0a3`");
    await queryRunner.query("ALTER TABLE `listing` DROP FOREIGN KEY `FK_cbdcfa3f43060d8128de2feb1d2`");
    await queryRunner.query("DROP TABLE `moisture_reading`");
    await queryRunner.query("DROP TABLE `listing_slab`");
    await queryRunner.query("DROP TABLE `slab`");
    await queryRunner.query("DROP TABLE `yard_log`");
    await queryRunner.query("DROP TABLE `listing_photo`");
    await queryRunner.query("DROP TABLE `listing`");
  }
}

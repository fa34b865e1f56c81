import type { MigrationInterface, QueryRunner } from "typeorm";

/** The buyers' catalogue (one flattened row per live listing) and where each pickup town lies. */
export class Catalogue1764684000000 implements MigrationInterface {
  name = "Catalogue1764684000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `catalogue_entry` (`listing_id` char(36) NOT NULL, `sawyer_id` char(36) NOT NULL, `title` varchar(120) NOT NULL, `species_slug` varchar(64) NOT NULL, `set_kind` varchar(12) NOT NULL, `slab_count` smallint NOT NULL, `length_mm` int NOT NULL, `thickness_mm` int NOT NULL, `average_width_mm` int NOT NULL, `min_width_mm` int NOT NULL, `usable_length_mm` int NOT NULL, `usable_width_mm` int NOT NULL, `usable_thickness_mm` int NOT NULL, `moisture_pct` double NULL, `ready` tinyint NOT NULL, `price_minor` bigint NOT NULL, `price_per_board_foot_minor` int NOT NULL, `currency` char(3) NOT NULL, `board_feet` double NOT NULL, `volume_m3` double NOT NULL, `weight_kg` double NOT NULL, `weight_high_kg` double NOT NULL, `live_edge` varchar(8) NOT NULL, `feature_bits` tinyint UNSIGNED NOT NULL, `freight` tinyint NOT NULL, `pickup` tinyint NOT NULL, `town` varchar(80) NULL, `yard_name` varchar(80) NULL, `latitude` double NULL, `longitude` double NULL, `photo_id` char(36) NULL, `photo_alt` varchar(300) NULL, `published_at` datetime(3) NOT NULL, INDEX `idx_catalogue_position` (`latitude`, `longitude`), INDEX `idx_catalogue_size` (`board_feet`, `listing_id`), INDEX `idx_catalogue_price_per_bf` (`price_per_board_foot_minor`, `listing_id`), INDEX `idx_catalogue_price` (`price_minor`, `listing_id`), INDEX `idx_catalogue_species_newest` (`species_slug`, `published_at`, `listing_id`), INDEX `idx_catalogue_newest` (`published_at`, `listing_id`), PRIMARY KEY (`listing_id`)) ENGINE=InnoDB",
    );
    await queryRunner.query(
      "CREATE INDEX `idx_catalogue_fit` ON `catalogue_entry` (`usable_length_mm`, `usable_width_mm`, `usable_thickness_mm`)",
    );
    await queryRunner.query("ALTER TABLE `account` ADD `pickup_latitude` double NULL");
    await queryRunner.query("ALTER TABLE `account` ADD `pickup_longitude` double NULL");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `pickup_longitude`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `pickup_latitude`");
    await queryRunner.query("DROP TABLE `catalogue_entry`");
  }
}

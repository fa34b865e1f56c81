import type { MigrationInterface, QueryRunner } from "typeorm";

/** One index holding every filtered column of the catalogue, so the capped count never reads whole rows. */
export class CatalogueFilterIndex1764720000000 implements MigrationInterface {
  name = "CatalogueFilterIndex1764720000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE INDEX `idx_catalogue_filters` ON `catalogue_entry` (`species_slug`, `length_mm`, `average_width_mm`, `min_width_mm`, `thickness_mm`, `moisture_pct`, `ready`, `price_minor`, `live_edge`, `feature_bits`, `set_kind`, `freight`, `latitude`, `longitude`, `usable_length_mm`, `usable_width_mm`, `usable_thickness_mm`)",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP INDEX `idx_catalogue_filters` ON `catalogue_entry`");
  }
}

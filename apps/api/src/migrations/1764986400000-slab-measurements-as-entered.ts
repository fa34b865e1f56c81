import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * A slab's length and thickness are kept exactly as entered (millimetres to six decimals: exact
 * for millimetre entries and for inches down to 1/64″), no longer rounded to whole millimetres,
 * so 2¼″ stays 57.15 mm and board feet match a hand calculation. The cached narrowest and widest
 * widths follow the stations, which may now carry fractions too.
 */
export class SlabMeasurementsAsEntered1764986400000 implements MigrationInterface {
  name = "SlabMeasurementsAsEntered1764986400000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "ALTER TABLE `slab` MODIFY `length_mm` decimal(12,6) NOT NULL, MODIFY `thickness_mm` decimal(12,6) NOT NULL, MODIFY `min_width_mm` double NOT NULL, MODIFY `max_width_mm` double NOT NULL",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    // Back to whole millimetres (rounded), as before.
    await queryRunner.query(
      "ALTER TABLE `slab` MODIFY `length_mm` int NOT NULL, MODIFY `thickness_mm` int NOT NULL, MODIFY `min_width_mm` int NOT NULL, MODIFY `max_width_mm` int NOT NULL",
    );
  }
}

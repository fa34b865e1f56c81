import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The catalogue names a set's weights apart: the whole set's high end (new; from the listing's
 * figures, which sum each end of the range over its slabs) beside the heaviest single slab's,
 * which the old `weight_high_kg` held under a name that read like the set's.
 */
export class CatalogueSetWeights1764802800000 implements MigrationInterface {
  name = "CatalogueSetWeights1764802800000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `catalogue_entry` CHANGE `weight_high_kg` `heaviest_slab_high_kg` double NOT NULL");
    await queryRunner.query("ALTER TABLE `catalogue_entry` ADD `total_weight_high_kg` double NOT NULL AFTER `weight_kg`");
    await queryRunner.query(
      "UPDATE `catalogue_entry` `e` JOIN `listing` `l` ON `l`.`id` = `e`.`listing_id` SET `e`.`total_weight_high_kg` = GREATEST(`l`.`weight_high_kg`, `e`.`heaviest_slab_high_kg`)",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `catalogue_entry` DROP COLUMN `total_weight_high_kg`");
    await queryRunner.query("ALTER TABLE `catalogue_entry` CHANGE `heaviest_slab_high_kg` `weight_high_kg` double NOT NULL");
  }
}

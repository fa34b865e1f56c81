import type { MigrationInterface, QueryRunner } from "typeorm";

/** Every filtered column as the previous migration indexed them, and now with the sawyer (the yard's position stands for it). */
const FILTERED_BEFORE = [
  "species_slug",
  "length_mm",
  "average_width_mm",
  "min_width_mm",
  "thickness_mm",
  "moisture_pct",
  "ready",
  "price_minor",
  "live_edge",
  "feature_bits",
  "set_kind",
  "freight",
  "latitude",
  "longitude",
  "usable_length_mm",
  "usable_width_mm",
  "usable_thickness_mm",
];
const FILTERED = [...FILTERED_BEFORE, "sawyer_id"];
const SORT_INDEXES: [name: string, sortKey: string][] = [
  ["idx_catalogue_newest", "published_at"],
  ["idx_catalogue_price", "price_minor"],
  ["idx_catalogue_price_per_bf", "price_per_board_foot_minor"],
  ["idx_catalogue_size", "board_feet"],
];
const columns = (names: string[]) => names.map((name) => `\`${name}\``).join(", ");
const covering = (sortKey: string) => columns([sortKey, "listing_id", ...FILTERED.filter((c) => c !== sortKey)]);

/**
 * The catalogue's sort indexes become covering: sort key, id, then every filtered column, so the
 * search finds a page's ids by walking one index and reads only the rows it shows. The yard
 * (sawyer) joins the filtered columns, with an index of its own for the nearest-first walk;
 * distances are worked out per yard, so the position index goes.
 */
export class CatalogueSortIndexes1764759600000 implements MigrationInterface {
  name = "CatalogueSortIndexes1764759600000";

  async up(queryRunner: QueryRunner): Promise<void> {
    for (const [name, sortKey] of SORT_INDEXES) {
      await queryRunner.query(`DROP INDEX \`${name}\` ON \`catalogue_entry\``);
      await queryRunner.query(`CREATE INDEX \`${name}\` ON \`catalogue_entry\` (${covering(sortKey)})`);
    }
    await queryRunner.query("DROP INDEX `idx_catalogue_filters` ON `catalogue_entry`");
    await queryRunner.query(`CREATE INDEX \`idx_catalogue_filters\` ON \`catalogue_entry\` (${columns(FILTERED)})`);
    await queryRunner.query(`CREATE INDEX \`idx_catalogue_yard\` ON \`catalogue_entry\` (${covering("sawyer_id")})`);
    await queryRunner.query("DROP INDEX `idx_catalogue_position` ON `catalogue_entry`");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("CREATE INDEX `idx_catalogue_position` ON `catalogue_entry` (`latitude`, `longitude`)");
    await queryRunner.query("DROP INDEX `idx_catalogue_yard` ON `catalogue_entry`");
    await queryRunner.query("DROP INDEX `idx_catalogue_filters` ON `catalogue_entry`");
    await queryRunner.query(`CREATE INDEX \`idx_catalogue_filters\` ON \`catalogue_entry\` (${columns(FILTERED_BEFORE)})`);
    for (const [name, sortKey] of SORT_INDEXES) {
      await queryRunner.query(`DROP INDEX \`${name}\` ON \`catalogue_entry\``);
      await queryRunner.query(`CREATE INDEX \`${name}\` ON \`catalogue_entry\` (${columns([sortKey, "listing_id"])})`);
    }
  }
}

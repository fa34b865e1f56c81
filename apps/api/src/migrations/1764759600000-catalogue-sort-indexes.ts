import type { MigrationInterface, QueryRunner } from "typeorm";

const FILTERED = [
  "species_slug", "length_mm", "average_width_mm", "min_width_mm", "thickness_mm", "moisture_pct", "ready", "price_minor", "live_edge",
  "feature_bits", "set_kind", "freight", "latitude", "longitude", "usable_length_mm", "usable_width_mm", "usable_thickness_mm",
];
const SORT_INDEXES: [name: string, sortKey: string][] = [
  ["idx_catalogue_newest", "published_at"],
  ["idx_catalogue_price", "price_minor"],
  ["idx_catalogue_price_per_bf", "price_per_board_foot_minor"],
  ["idx_catalogue_size", "board_feet"],
];
const columns = (names: string[]) => names.map((name) => `\`${name}\``).join(", ");

/**
 * The catalogue's sort indexes become covering: sort key, id, then every filtered column, so the
 * search finds a page's ids by walking one index and reads only the rows it shows.
 */
export class CatalogueSortIndexes1764759600000 implements MigrationInterface {
  name = "CatalogueSortIndexes1764759600000";

  async up(queryRunner: QueryRunner): Promise<void> {
    for (const [name, sortKey] of SORT_INDEXES) {
      await queryRunner.query(`DROP INDEX \`${name}\` ON \`catalogue_entry\``);
      await queryRunner.query(`CREATE INDEX \`${name}\` ON \`catalogue_entry\` (${columns([sortKey, "listing_id", ...FILTERED.filter((c) => c !== sortKey)])})`);
    }
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    for (const [name, sortKey] of SORT_INDEXES) {
      await queryRunner.query(`DROP INDEX \`${name}\` ON \`catalogue_entry\``);
      await queryRunner.query(`CREATE INDEX \`${name}\` ON \`catalogue_entry\` (${columns([sortKey, "listing_id"])})`);
    }
  }
}

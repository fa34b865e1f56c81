import type { MigrationInterface, QueryRunner } from "typeorm";

/** The address of a yard's page: its name in lower case, letters and digits joined by hyphens (kept as the migration made it). */
function slugOf(name: string): string {
  const slug = name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/&/g, " and ")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 80)
    .replace(/-+$/, "");
  return slug || "yard";
}

/**
 * Public yard pages: each yard's page address (`yard_slug`, unique, from its name) and the
 * story its sawyer tells there; the catalogue row keeps the slug so a card can link to the page.
 * Existing yards get a slug from their name now (a number added where two names meet).
 */
export class YardPages1764824400000 implements MigrationInterface {
  name = "YardPages1764824400000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `account` ADD `yard_slug` varchar(96) NULL");
    await queryRunner.query("ALTER TABLE `account` ADD `yard_story` text NULL");
    await queryRunner.query("ALTER TABLE `account` ADD UNIQUE INDEX `uq_account_yard_slug` (`yard_slug`)");
    await queryRunner.query("ALTER TABLE `catalogue_entry` ADD `yard_slug` varchar(96) NULL");
    const yards = (await queryRunner.query(
      "SELECT `id`, `yard_name` FROM `account` WHERE `yard_name` IS NOT NULL ORDER BY `created_at`, `id`",
    )) as { id: string; yard_name: string }[];
    const taken = new Set<string>();
    for (const yard of yards) {
      const base = slugOf(yard.yard_name);
      let slug = base;
      for (let n = 2; taken.has(slug); n++) slug = `${base}-${n}`;
      taken.add(slug);
      await queryRunner.query("UPDATE `account` SET `yard_slug` = ? WHERE `id` = ?", [slug, yard.id]);
    }
    await queryRunner.query(
      "UPDATE `catalogue_entry` `e` JOIN `account` `a` ON `a`.`id` = `e`.`sawyer_id` SET `e`.`yard_slug` = `a`.`yard_slug`",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `catalogue_entry` DROP COLUMN `yard_slug`");
    await queryRunner.query("ALTER TABLE `account` DROP INDEX `uq_account_yard_slug`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `yard_story`");
    await queryRunner.query("ALTER TABLE `account` DROP COLUMN `yard_slug`");
  }
}

import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * A version number per shared cache (the catalogue's answers and the yards' positions): bumped
 * after every change, read by every API instance twice a second, so all of them drop their copies
 * together (jobs/shared-invalidation.ts).
 */
export class CacheVersion1764993600000 implements MigrationInterface {
  name = "CacheVersion1764993600000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `cache_version` (`name` varchar(40) CHARACTER SET ascii COLLATE ascii_bin NOT NULL, `version` bigint UNSIGNED NOT NULL DEFAULT 0, `changed_at` datetime(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3), PRIMARY KEY (`name`)) ENGINE=InnoDB",
    );
    await queryRunner.query("INSERT INTO `cache_version` (`name`, `version`) VALUES ('catalogue', 0)");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `cache_version`");
  }
}

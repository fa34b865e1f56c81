import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * The shared store of the sign-in and reset limits (rate-limiter-flexible's MySQL store), so every
 * API instance counts the same tries. The library writes its rows positionally (key, points,
 * expire); keys are ASCII (a prefix, a hash of the e-mail address, an IP address); `expire` is in
 * milliseconds since the epoch, indexed for the library's clean-up of expired rows.
 */
export class RateLimits1764792000000 implements MigrationInterface {
  name = "RateLimits1764792000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `rate_limit` (`key` varchar(255) CHARACTER SET ascii COLLATE ascii_bin NOT NULL, `points` int NOT NULL DEFAULT 0, `expire` bigint UNSIGNED NULL, INDEX `idx_rate_limit_expire` (`expire`), PRIMARY KEY (`key`)) ENGINE=InnoDB",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `rate_limit`");
  }
}

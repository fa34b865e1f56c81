import type { MigrationInterface, QueryRunner } from "typeorm";

/** The yard's IANA time zone stored with an order's pickup windows, so every reader sees them in yard time. */
export class PickupTimeZone1765040000000 implements MigrationInterface {
  name = "PickupTimeZone1765040000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `pickup_time_zone` varchar(64) NULL");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `pickup_time_zone`");
  }
}

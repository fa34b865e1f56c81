import type { MigrationInterface, QueryRunner } from "typeorm";

/** Why a sawyer marked an order handed over before the booked pickup time (the buyer reads it). */
export class HandOverNote1764990000000 implements MigrationInterface {
  name = "HandOverNote1764990000000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `hand_over_note` varchar(500) NULL");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `hand_over_note`");
  }
}

import type { MigrationInterface, QueryRunner } from "typeorm";

/**
 * Every refund on an order gets a row in `order_refund` (until now only an admin's dispute
 * refunds had one): its kind, and the idempotency key the provider was given, unique, so a retry
 * finds the same row. Rows made before are dispute refunds, whose key was `dispute-<id>`.
 * `created_by` is empty when Grainyard itself refunded (a payment for a slab sold elsewhere).
 */
export class OneRefundRecord1764770400000 implements MigrationInterface {
  name = "OneRefundRecord1764770400000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `order_refund` ADD `kind` varchar(20) NOT NULL DEFAULT 'dispute'");
    await queryRunner.query("ALTER TABLE `order_refund` ALTER `kind` DROP DEFAULT");
    await queryRunner.query("ALTER TABLE `order_refund` ADD `idempotency_key` varchar(80) NULL");
    await queryRunner.query("UPDATE `order_refund` SET `idempotency_key` = CONCAT('dispute-', `id`)");
    await queryRunner.query("ALTER TABLE `order_refund` MODIFY `idempotency_key` varchar(80) NOT NULL");
    await queryRunner.query("ALTER TABLE `order_refund` ADD UNIQUE INDEX `IDX_0234319f2e4d05d361f150a106` (`idempotency_key`)");
    await queryRunner.query("ALTER TABLE `order_refund` CHANGE `created_by` `created_by` char(36) NULL");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    // Only dispute refunds had rows before; the others are recorded on the order itself (refund_id, refunded_at).
    await queryRunner.query("DELETE FROM `order_refund` WHERE `kind` <> 'dispute'");
    await queryRunner.query("ALTER TABLE `order_refund` CHANGE `created_by` `created_by` char(36) NOT NULL");
    await queryRunner.query("ALTER TABLE `order_refund` DROP INDEX `IDX_0234319f2e4d05d361f150a106`");
    await queryRunner.query("ALTER TABLE `order_refund` DROP COLUMN `idempotency_key`");
    await queryRunner.query("ALTER TABLE `order_refund` DROP COLUMN `kind`");
  }
}

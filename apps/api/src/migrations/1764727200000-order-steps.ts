import type { MigrationInterface, QueryRunner } from "typeorm";

/** The steps after payment: pickup windows, shipment, hand-over, completion, cancellation and refund, each stamped. */
export class OrderSteps1764727200000 implements MigrationInterface {
  name = "OrderSteps1764727200000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `pickup_windows` text NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `pickup_address` varchar(300) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `pickup_starts_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `pickup_ends_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `ready_for_pickup_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `pickup_chosen_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `carrier` varchar(80) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `tracking_reference` varchar(120) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `shipped_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `handed_over_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `completed_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `completed_by` varchar(10) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `cancelled_at` datetime(3) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `cancelled_by` varchar(10) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `cancel_reason` varchar(500) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `refund_id` varchar(80) NULL");
    await queryRunner.query("ALTER TABLE `buyer_order` ADD `refunded_at` datetime(3) NULL");
    await queryRunner.query("CREATE INDEX `idx_buyer_order_handed_over` ON `buyer_order` (`status`, `handed_over_at`)");
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP INDEX `idx_buyer_order_handed_over` ON `buyer_order`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `refunded_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `refund_id`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `cancel_reason`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `cancelled_by`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `cancelled_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `completed_by`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `completed_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `handed_over_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `shipped_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `tracking_reference`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `carrier`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `pickup_chosen_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `ready_for_pickup_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `pickup_ends_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `pickup_starts_at`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `pickup_address`");
    await queryRunner.query("ALTER TABLE `buyer_order` DROP COLUMN `pickup_windows`");
  }
}

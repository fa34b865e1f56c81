import type { MigrationInterface, QueryRunner } from "typeorm";

/** Problems buyers report after hand-over (one per order), settled on the desk with a refund or by releasing the sale. */
export class OrderProblems1765018800000 implements MigrationInterface {
  name = "OrderProblems1765018800000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `order_problem` (`id` char(36) NOT NULL, `order_id` char(36) NOT NULL, `buyer_id` char(36) NOT NULL, `kind` varchar(20) NOT NULL, `comment` text NOT NULL, `status` varchar(12) NOT NULL, `resolved_by` char(36) NULL, `resolution_note` text NULL, `refunded_minor` bigint NULL, `resolved_at` datetime(3) NULL, `created_at` datetime(3) NOT NULL, INDEX `idx_order_problem_status` (`status`, `created_at`), UNIQUE INDEX `uq_order_problem_order` (`order_id`), PRIMARY KEY (`id`)) ENGINE=InnoDB",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `order_problem`");
  }
}

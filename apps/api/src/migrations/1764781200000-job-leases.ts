import type { MigrationInterface, QueryRunner } from "typeorm";

/** A lease per scheduled job (reservation sweep, order sweeps, alerts): one instance runs each at a time. */
export class JobLeases1764781200000 implements MigrationInterface {
  name = "JobLeases1764781200000";

  async up(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query(
      "CREATE TABLE `job_lease` (`job_name` varchar(60) NOT NULL, `holder` varchar(80) NOT NULL, `expires_at` datetime(3) NOT NULL, `runs` int NOT NULL DEFAULT 0, PRIMARY KEY (`job_name`)) ENGINE=InnoDB",
    );
  }

  async down(queryRunner: QueryRunner): Promise<void> {
    await queryRunner.query("DROP TABLE `job_lease`");
  }
}

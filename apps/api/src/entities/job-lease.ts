import { Column, Entity, PrimaryColumn } from "typeorm";

/**
 * Who runs a scheduled job now: the API instance holding its lease until `expiresAt` (database
 * time). Several instances tick; only the holder of an unexpired lease runs the job.
 */
@Entity({ name: "job_lease" })
export class JobLeaseEntity {
  @PrimaryColumn({ name: "job_name", type: "varchar", length: 60 })
  jobName: string;

  @Column({ type: "varchar", length: 80 })
  holder: string;

  @Column({ name: "expires_at", type: "datetime", precision: 3 })
  expiresAt: Date;

  @Column({ name: "runs", type: "int", default: 0 })
  runs: number;
}

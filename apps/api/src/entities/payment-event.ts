import { Column, CreateDateColumn, Entity, PrimaryColumn } from "typeorm";

/** Every provider event handled once: its id is the key, so a repeated delivery changes nothing. */
@Entity({ name: "payment_event" })
export class PaymentEventEntity {
  @PrimaryColumn({ type: "varchar", length: 80 })
  id: string;

  @Column({ type: "varchar", length: 60 })
  type: string;

  @Column({ type: "text" })
  payload: string;

  @CreateDateColumn({ name: "received_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  receivedAt: Date;
}

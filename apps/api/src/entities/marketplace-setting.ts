import { Column, Entity, PrimaryColumn } from "typeorm";

/** One admin-editable marketplace setting (fees, hold days, reservation minutes, tax), as JSON. */
@Entity({ name: "marketplace_setting" })
export class MarketplaceSettingEntity {
  @PrimaryColumn({ name: "setting_key", type: "varchar", length: 60 })
  key: string;

  @Column({ type: "simple-json" })
  value: unknown;

  @Column({ name: "updated_by", type: "char", length: 36, nullable: true })
  updatedBy: string | null;

  @Column({ name: "updated_at", type: "datetime", precision: 3 })
  updatedAt: Date;
}

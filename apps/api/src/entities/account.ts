import { Column, CreateDateColumn, Entity, Index, PrimaryColumn, UpdateDateColumn } from "typeorm";
import type { Role } from "@grainyard/contracts";

/** A person who signs in: a buyer, a sawyer (with a yard) or an admin. */
@Entity({ name: "account" })
@Index("uq_account_yard_slug", ["yardSlug"], { unique: true })
export class AccountEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ type: "varchar", length: 254, unique: true })
  email: string;

  @Column({ name: "password_hash", type: "varchar", length: 100 })
  passwordHash: string;

  @Column({ type: "varchar", length: 16 })
  role: Role;

  @Column({ name: "display_name", type: "varchar", length: 80 })
  displayName: string;

  @Column({ name: "yard_name", type: "varchar", length: 80, nullable: true })
  yardName: string | null;

  /** The address of the yard's public page (`/yards/<slug>`), from its name; unique. */
  @Column({ name: "yard_slug", type: "varchar", length: 96, nullable: true })
  yardSlug: string | null;

  /** What the sawyer tells buyers on the yard's public page. */
  @Column({ name: "yard_story", type: "text", nullable: true })
  yardStory: string | null;

  @Column({ name: "pickup_town", type: "varchar", length: 80, nullable: true })
  pickupTown: string | null;

  /** Where the pickup town lies (from the places dataset, looked up on save); null when not found. */
  @Column({ name: "pickup_latitude", type: "double", nullable: true })
  pickupLatitude: number | null;

  @Column({ name: "pickup_longitude", type: "double", nullable: true })
  pickupLongitude: number | null;

  @Column({ name: "email_verified_at", type: "datetime", precision: 3, nullable: true })
  emailVerifiedAt: Date | null;

  /** Set while an admin has suspended the account: no sign-in, sessions dead, listings hidden. */
  @Column({ name: "suspended_at", type: "datetime", precision: 3, nullable: true })
  suspendedAt: Date | null;

  @Column({ name: "suspension_reason", type: "text", nullable: true })
  suspensionReason: string | null;

  /** The second factor's shared secret (Base32) once it is on; null while it is off. */
  @Column({ name: "totp_secret", type: "varchar", length: 64, nullable: true })
  totpSecret: string | null;

  /** A set-up's new secret until its first code confirms it (then it moves to `totpSecret`). */
  @Column({ name: "totp_pending_secret", type: "varchar", length: 64, nullable: true })
  totpPendingSecret: string | null;

  /** When the second factor was switched on. */
  @Column({ name: "totp_on_at", type: "datetime", precision: 3, nullable: true })
  totpOnAt: Date | null;

  /** The last 30-second time step whose code was accepted: a code of that step or an earlier one is never taken again. */
  @Column({ name: "totp_last_step", type: "int", nullable: true })
  totpLastStep: number | null;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @UpdateDateColumn({
    name: "updated_at",
    type: "datetime",
    precision: 3,
    default: () => "CURRENT_TIMESTAMP(3)",
    onUpdate: "CURRENT_TIMESTAMP(3)",
  })
  updatedAt: Date;
}

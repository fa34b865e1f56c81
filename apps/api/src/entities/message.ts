import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from "typeorm";
import { AccountEntity } from "./account.ts";
import { MessageThreadEntity } from "./message-thread.ts";

/** One message in a thread; read_at is set when the other party opens the thread. */
@Entity({ name: "message" })
@Index("idx_message_thread", ["threadId", "id"])
@Index("idx_message_unread", ["threadId", "readAt"])
export class MessageEntity {
  /** Increasing: the order of the conversation, even within one millisecond. */
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  @Column({ name: "thread_id", type: "char", length: 36 })
  threadId: string;

  @ManyToOne(() => MessageThreadEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "thread_id" })
  thread?: MessageThreadEntity;

  @Column({ name: "author_id", type: "char", length: 36 })
  authorId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "author_id" })
  author?: AccountEntity;

  @Column({ type: "text" })
  body: string;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;

  @Column({ name: "read_at", type: "datetime", precision: 3, nullable: true })
  readAt: Date | null;
}

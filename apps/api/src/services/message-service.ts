import { randomUUID } from "node:crypto";
import type { Message, MessageInput, MessagePosted, ThreadDetail, ThreadSummary } from "@grainyard/contracts";
import { messageInputSchema } from "@grainyard/contracts";
import { In, IsNull, Not, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, ListingEntity, MessageEntity, MessageThreadEntity } from "../entities/index.ts";
import { Forbidden, NotFound } from "../errors.ts";
import type { MailQueue } from "./mail-outbox.ts";
import { messageNoticeMail } from "../mail-templates.ts";
import { requireRole, requireSignedIn, type Actor, type SignedInActor } from "./actor.ts";

const EXCERPT_LENGTH = 160;

/** A message's first words on one line, for lists and e-mail notices. */
function excerptOf(body: string, length = EXCERPT_LENGTH): string {
  const line = body.replace(/\s+/g, " ").trim();
  return line.length <= length ? line : `${line.slice(0, length - 1).trimEnd()}…`;
}

export interface MessageServiceDependencies {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  now?: () => Date;
}

/**
 * Questions about a listing: one thread per asker and listing, between the asker and the
 * listing's sawyer. Only the two of them read and write it; admins may read, never write.
 */
export function createMessageService(deps: MessageServiceDependencies) {
  const { dataSource, config } = deps;
  const now = deps.now ?? (() => new Date());

  function sideOf(thread: MessageThreadEntity, accountId: string): "buyer" | "sawyer" | null {
    return thread.buyerId === accountId ? "buyer" : thread.sawyerId === accountId ? "sawyer" : null;
  }

  /** The thread, if the actor may read it: one of its two people, or an admin. */
  async function readableThread(manager: EntityManager, reader: SignedInActor, threadId: string): Promise<MessageThreadEntity> {
    const thread = await manager.getRepository(MessageThreadEntity).findOneBy({ id: threadId });
    if (!thread) throw new NotFound("No conversation with that id.");
    if (!sideOf(thread, reader.accountId) && reader.role !== "admin") throw new Forbidden("That conversation is between other people.");
    return thread;
  }

  function messageView(message: MessageEntity, readerId: string, names: Map<string, AccountEntity>): Message {
    return {
      id: message.id,
      threadId: message.threadId,
      authorId: message.authorId,
      authorName: names.get(message.authorId)?.displayName ?? "Former member",
      fromMe: message.authorId === readerId,
      body: message.body,
      createdAt: message.createdAt.toISOString(),
      readAt: message.readAt?.toISOString() ?? null,
    };
  }

  /** Summaries for a reader, with four queries whatever the number of threads. */
  async function summaries(manager: EntityManager, threads: MessageThreadEntity[], readerId: string): Promise<ThreadSummary[]> {
    if (threads.length === 0) return [];
    const threadIds = threads.map((t) => t.id);
    const [listings, accounts, lastMessages, unread] = await Promise.all([
      manager
        .getRepository(ListingEntity)
        .find({ where: { id: In([...new Set(threads.map((t) => t.listingId))]) }, select: { id: true, title: true } }),
      manager.getRepository(AccountEntity).find({ where: { id: In([...new Set(threads.flatMap((t) => [t.buyerId, t.sawyerId]))]) } }),
      manager
        .getRepository(MessageEntity)
        .createQueryBuilder("message")
        .where(
          "message.id IN (SELECT MAX(latest.id) FROM message latest WHERE latest.thread_id IN (:...threadIds) GROUP BY latest.thread_id)",
          { threadIds },
        )
        .getMany(),
      manager
        .getRepository(MessageEntity)
        .createQueryBuilder("message")
        .select("message.thread_id", "threadId")
        .addSelect("COUNT(*)", "unread")
        .where("message.thread_id IN (:...threadIds)", { threadIds })
        .andWhere("message.author_id <> :readerId", { readerId })
        .andWhere("message.read_at IS NULL")
        .groupBy("message.thread_id")
        .getRawMany<{ threadId: string; unread: string | number }>(),
    ]);
    const account = (id: string) => accounts.find((a) => a.id === id);
    return threads.map((thread) => {
      const side = sideOf(thread, readerId);
      const buyer = account(thread.buyerId);
      const sawyer = account(thread.sawyerId);
      const last = lastMessages.find((m) => m.threadId === thread.id);
      const buyerView = { id: thread.buyerId, displayName: buyer?.displayName ?? "Former member" };
      const sawyerView = { id: thread.sawyerId, displayName: sawyer?.displayName ?? "Former member", yardName: sawyer?.yardName ?? null };
      return {
        id: thread.id,
        listingId: thread.listingId,
        listingTitle: listings.find((l) => l.id === thread.listingId)?.title ?? "",
        myRole: side ?? "observer",
        buyer: buyerView,
        sawyer: sawyerView,
        otherParty: side === "sawyer" ? buyerView : { id: sawyerView.id, displayName: sawyerView.displayName },
        lastMessage: last
          ? {
              authorId: last.authorId,
              fromMe: last.authorId === readerId,
              excerpt: excerptOf(last.body),
              createdAt: last.createdAt.toISOString(),
            }
          : null,
        unreadCount: side ? Number(unread.find((u) => u.threadId === thread.id)?.unread ?? 0) : 0,
        lastMessageAt: thread.lastMessageAt.toISOString(),
        createdAt: thread.createdAt.toISOString(),
      };
    });
  }

  async function addMessage(manager: EntityManager, thread: MessageThreadEntity, authorId: string, body: string): Promise<MessageEntity> {
    const at = now();
    const inserted = await manager
      .getRepository(MessageEntity)
      .insert({ threadId: thread.id, authorId, body, createdAt: at, readAt: null });
    await manager.getRepository(MessageThreadEntity).update({ id: thread.id }, { lastMessageAt: at });
    return manager.getRepository(MessageEntity).findOneByOrFail({ id: String(inserted.identifiers[0]!.id) });
  }

  /** A notice to the other party with a short excerpt and the thread's link, in the message's own transaction. */
  async function notify(manager: EntityManager, thread: MessageThreadEntity, authorId: string, body: string) {
    const recipientId = thread.buyerId === authorId ? thread.sawyerId : thread.buyerId;
    const [recipient, author, listing] = await Promise.all([
      manager.getRepository(AccountEntity).findOneBy({ id: recipientId }),
      manager.getRepository(AccountEntity).findOneBy({ id: authorId }),
      manager.getRepository(ListingEntity).findOneBy({ id: thread.listingId }),
    ]);
    if (!recipient || !author) return;
    const fromName = authorId === thread.sawyerId && author.yardName ? `${author.displayName} (${author.yardName})` : author.displayName;
    await deps.mail.queue(
      manager,
      "message_notice",
      messageNoticeMail(
        recipient.email,
        recipient.displayName,
        fromName,
        listing?.title ?? "a listing",
        excerptOf(body),
        `${config.publicUrl}/messages/${thread.id}`,
      ),
    );
  }

  async function posted(thread: MessageThreadEntity, message: MessageEntity, readerId: string): Promise<MessagePosted> {
    const [summary] = await summaries(
      dataSource.manager,
      [await dataSource.getRepository(MessageThreadEntity).findOneByOrFail({ id: thread.id })],
      readerId,
    );
    const author = await dataSource.getRepository(AccountEntity).findOneBy({ id: message.authorId });
    return { thread: summary!, message: messageView(message, readerId, new Map(author ? [[author.id, author]] : [])) };
  }

  return {
    /** Starts or continues the asker's thread about a listing. A new thread needs a live listing. */
    async askAboutListing(actor: Actor, listingId: string, input: MessageInput): Promise<MessagePosted> {
      const asker = requireRole(actor, "buyer", "sawyer");
      const { body } = messageInputSchema.parse(input);
      const { thread, message } = await dataSource.transaction(async (manager) => {
        const listing = await manager.getRepository(ListingEntity).findOneBy({ id: listingId });
        if (!listing) throw new NotFound("That slab is not for sale here.");
        if (listing.sawyerId === asker.accountId)
          throw new Forbidden("This is your own listing: buyers' questions reach you in your messages.", "own_listing");
        const threads = manager.getRepository(MessageThreadEntity);
        let thread = await threads.findOne({ where: { buyerId: asker.accountId, listingId }, lock: { mode: "pessimistic_write" } });
        if (!thread) {
          if (listing.status !== "live") throw new NotFound("That slab is not for sale here.");
          const at = now();
          // One thread per asker and listing, even when two first messages race (unique key).
          await threads
            .createQueryBuilder()
            .insert()
            .into(MessageThreadEntity)
            .values({ id: randomUUID(), listingId, buyerId: asker.accountId, sawyerId: listing.sawyerId, lastMessageAt: at, createdAt: at })
            .orIgnore()
            .execute();
          thread = await threads.findOneOrFail({ where: { buyerId: asker.accountId, listingId }, lock: { mode: "pessimistic_write" } });
        }
        const message = await addMessage(manager, thread, asker.accountId, body);
        await notify(manager, thread, asker.accountId, body);
        return { thread, message };
      });
      return posted(thread, message, asker.accountId);
    },

    /** An answer in an existing thread, by one of its two people. */
    async reply(actor: Actor, threadId: string, input: MessageInput): Promise<MessagePosted> {
      const author = requireSignedIn(actor);
      const { body } = messageInputSchema.parse(input);
      const { thread, message } = await dataSource.transaction(async (manager) => {
        const thread = await manager
          .getRepository(MessageThreadEntity)
          .findOne({ where: { id: threadId }, lock: { mode: "pessimistic_write" } });
        if (!thread) throw new NotFound("No conversation with that id.");
        if (!sideOf(thread, author.accountId)) {
          throw new Forbidden(
            author.role === "admin" ? "Admins can read conversations but not write in them." : "That conversation is between other people.",
          );
        }
        const message = await addMessage(manager, thread, author.accountId, body);
        await notify(manager, thread, author.accountId, body);
        return { thread, message };
      });
      return posted(thread, message, author.accountId);
    },

    /** The reader's own threads (as asker or as sawyer), latest activity first. */
    async list(actor: Actor): Promise<ThreadSummary[]> {
      const reader = requireSignedIn(actor);
      const threads = await dataSource.getRepository(MessageThreadEntity).find({
        where: [{ buyerId: reader.accountId }, { sawyerId: reader.accountId }],
        order: { lastMessageAt: "DESC", id: "ASC" },
        take: 200,
      });
      return summaries(dataSource.manager, threads, reader.accountId);
    },

    /** One thread's messages, oldest first; opening it marks the other party's messages read (not for an admin). */
    async get(actor: Actor, threadId: string): Promise<ThreadDetail> {
      const reader = requireSignedIn(actor);
      const thread = await readableThread(dataSource.manager, reader, threadId);
      if (sideOf(thread, reader.accountId)) {
        await dataSource
          .getRepository(MessageEntity)
          .update({ threadId, authorId: Not(reader.accountId), readAt: IsNull() }, { readAt: now() });
      }
      const messages = await dataSource.getRepository(MessageEntity).find({ where: { threadId }, order: { id: "ASC" } });
      const names = new Map(
        (await dataSource.getRepository(AccountEntity).find({ where: { id: In([thread.buyerId, thread.sawyerId]) } })).map((a) => [
          a.id,
          a,
        ]),
      );
      const [summary] = await summaries(dataSource.manager, [thread], reader.accountId);
      return { thread: summary!, messages: messages.map((m) => messageView(m, reader.accountId, names)) };
    },
  };
}

export type MessageService = ReturnType<typeof createMessageService>;

import { orderSearchSchema, type OrderSearchInput } from "@grainyard/contracts";
import type { DataSource } from "typeorm";
import { AccountEntity, OrderEntity } from "../entities/index.ts";

/** `LIKE` text for words anywhere in a column: the user's own `%`, `_` and `\` match themselves. */
function containsPattern(words: string): string {
  return `%${words.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/**
 * The order number people read ("3F2A9C1B", sometimes with a "#") as the start of an order id, or
 * null when the words cannot be one (only hex digits and dashes).
 */
function orderNumberPrefix(words: string): string | null {
  const bare = words.trim().replace(/^#/, "").toLowerCase();
  return /^[0-9a-f-]{4,36}$/.test(bare) ? bare : null;
}

/**
 * The operator desk's order search, newest first in keyset pages over (created_at, id): the words
 * are looked for in the buyer's name and e-mail, the sawyer's name, e-mail and yard, the slab's
 * title on the order, and the start of the order id. Answers the page's orders and the next cursor.
 * (Substring search scans the orders; the desk is one person's tool, not the catalogue.)
 */
export async function searchOrdersForDesk(
  dataSource: DataSource,
  input: OrderSearchInput,
): Promise<{ orders: OrderEntity[]; nextCursor: string | null }> {
  const { q, cursor, limit } = orderSearchSchema.parse(input);
  const query = dataSource
    .getRepository(OrderEntity)
    .createQueryBuilder("o")
    .innerJoin(AccountEntity, "buyer", "buyer.id = o.buyer_id")
    .innerJoin(AccountEntity, "sawyer", "sawyer.id = o.sawyer_id")
    .orderBy("o.created_at", "DESC")
    .addOrderBy("o.id", "DESC")
    .take(limit + 1);
  if (q) {
    const columns = ["buyer.display_name", "buyer.email", "sawyer.display_name", "sawyer.email", "sawyer.yard_name", "o.title"];
    const prefix = orderNumberPrefix(q);
    const matches = columns.map((column) => `${column} LIKE :words`);
    if (prefix) matches.push("o.id LIKE :prefix");
    query.andWhere(`(${matches.join(" OR ")})`, { words: containsPattern(q), prefix: `${prefix}%` });
  }
  if (cursor) {
    const [ms, id] = cursor.split(".") as [string, string];
    const after = new Date(Number(ms));
    query.andWhere("(o.created_at < :after OR (o.created_at = :after AND o.id < :id))", { after, id });
  }
  const rows = await query.getMany();
  const page = rows.slice(0, limit);
  const last = page.at(-1);
  return { orders: page, nextCursor: rows.length > limit && last ? `${last.createdAt.getTime()}.${last.id}` : null };
}

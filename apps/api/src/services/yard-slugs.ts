import type { DataSource, EntityManager } from "typeorm";

/**
 * The address of a yard's public page from its name: lower case, accents dropped, "&" as "and",
 * letters and digits joined by single hyphens ("Quarry Ridge Tree & Timber" → "quarry-ridge-tree-and-timber").
 */
function yardSlugOf(name: string): string {
  const slug = name
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/&/g, " and ")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 80)
    .replace(/-+$/, "");
  return slug || "yard";
}

/** A slug for `yardName` that no other account holds (a number added where two names meet). */
export async function freeYardSlug(manager: EntityManager | DataSource, yardName: string, accountId: string): Promise<string> {
  const base = yardSlugOf(yardName);
  const rows = (await manager.query("SELECT yard_slug FROM account WHERE (yard_slug = ? OR yard_slug LIKE ?) AND id <> ?", [
    base,
    `${base}-%`,
    accountId,
  ])) as { yard_slug: string }[];
  const taken = new Set(rows.map((row) => row.yard_slug));
  let slug = base;
  for (let n = 2; taken.has(slug); n++) slug = `${base}-${n}`;
  return slug;
}

import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import type { Role } from "@grainyard/contracts";
import { AccountEntity } from "../entities/index.ts";
import { pickupPosition } from "../services/account-service.ts";
import { freeYardSlug } from "../services/yard-slugs.ts";
import { hashPassword } from "../services/passwords.ts";
import { newTotpSecret } from "../services/second-factor-service.ts";
import { AuditEntryEntity } from "../entities/index.ts";

/**
 * The Lakemont demo: an invented lake city, its urban sawyers and some buyers.
 * Names, yards, towns and addresses are made up; the .test domain never delivers mail.
 */
export interface DemoAccount {
  email: string;
  password: string;
  role: Role;
  displayName: string;
  yardName?: string;
  /** When the yard joined Grainyard (its page's "member since"). */
  memberSince?: string;
  /** What the yard tells buyers on its page. */
  story?: string;
  pickupTown?: string;
  note: string;
}

export const demoAccounts: DemoAccount[] = [
  {
    email: "desk@grainyard.test",
    password: "lakemont-desk-2026",
    role: "admin",
    displayName: "Grainyard desk (Wren Halloway)",
    note: "admin",
  },
  {
    email: "yard@ridgeback-timber.test",
    password: "ridgeback-bandmill-2026",
    role: "sawyer",
    displayName: "Oskar Lindqvist",
    yardName: "Ridgeback Urban Timber",
    memberSince: "2021-04-12",
    story:
      "Two of us and a band mill at the east end of Lakemont. We take Lakemont's street trees when the city's crews bring them down — storm-split maples, hollow oaks, the odd backyard cherry — and keep every log's slabs together from the first cut to the kiln. Ask us which street your slab grew on.",
    pickupTown: "Lakemont",
    note: "sawyer, two-person band-mill yard",
  },
  {
    email: "hello@cobblelane-slabs.test",
    password: "cobblelane-chainsaw-2026",
    role: "sawyer",
    displayName: "Dana Okafor",
    yardName: "Cobble Lane Slabworks",
    memberSince: "2022-02-03",
    story:
      "A chainsaw mill that goes where the trees fall. I work beside the city's tree crews and mill on the spot when a log is too big to move, so the wide slabs here are the ones a truck could not have carried whole.",
    pickupTown: "East Lakemont",
    note: "sawyer, chainsaw mill with the city's tree crews",
  },
  {
    email: "kiln@northshore-coop.test",
    password: "northshore-kiln-2026",
    role: "sawyer",
    displayName: "Priya Marchetti",
    yardName: "Northshore Kiln Co-op",
    memberSince: "2020-09-21",
    story:
      "A kiln and a heated store shared by a dozen small sawyers along the north shore. Our slabs are dried slowly and read monthly; we finish them in the kiln and heat-treat every load.",
    pickupTown: "Northshore",
    note: "sawyer, shared kiln co-op",
  },
  {
    email: "mill@heronpoint-mill.test",
    password: "heronpoint-bandsaw-2026",
    role: "sawyer",
    displayName: "Tobias Reinholt",
    yardName: "Heron Point Mill",
    memberSince: "2022-06-30",
    story:
      "A portable band mill on a trailer that follows the county park crews. Storm-dropped park trees mostly: red maple, ash, the occasional locust from the marina.",
    pickupTown: "Heron Point",
    note: "sawyer, portable band mill that follows the county park crews",
  },
  {
    email: "woodlot@cedarhollow.test",
    password: "cedarhollow-solar-kiln-2026",
    role: "sawyer",
    displayName: "Greta Solberg",
    yardName: "Cedar Hollow Woodlot",
    memberSince: "2021-11-08",
    story:
      "A farm woodlot with a solar kiln behind the red barn. Walnut from the fence rows, hickory and cedar from the windbreak; everything cut here dries here.",
    pickupTown: "Cedar Hollow",
    note: "sawyer, farm woodlot with a solar kiln",
  },
  {
    email: "barn@ashgrove-slabs.test",
    password: "ashgrove-barn-2026",
    role: "sawyer",
    displayName: "Wendell Okoro",
    yardName: "Ashgrove Slab Barn",
    memberSince: "2019-05-17",
    story:
      "A barn full of ash and elm from the years the borer took Ashgrove's street trees. We saved what we could and have been drying it ever since.",
    pickupTown: "Ashgrove",
    note: "sawyer, a barn of ash and elm from the borer years",
  },
  {
    email: "crew@quarryridge-trees.test",
    password: "quarryridge-arborists-2026",
    role: "sawyer",
    displayName: "Rosalind Achterberg",
    yardName: "Quarry Ridge Tree & Timber",
    memberSince: "2023-03-14",
    story:
      "An arborist crew that mills its own removals instead of chipping them. Osage orange from the old hedgerows, maples from Ridge Avenue.",
    pickupTown: "Quarry Ridge",
    note: "sawyer, an arborist crew that mills its own removals",
  },
  {
    email: "office@millbrook-kiln.test",
    password: "millbrook-dehumidifier-2026",
    role: "sawyer",
    displayName: "Imre Castellanos",
    yardName: "Millbrook Kiln Works",
    memberSince: "2020-01-27",
    story:
      "The region's biggest dehumidification kiln. We dry for other yards too, and sell what we mill ourselves from Millbrook's fairgrounds, mill pond and bridge works.",
    pickupTown: "Millbrook",
    note: "sawyer, the region's biggest kiln",
  },
  {
    email: "dock@oldharbour-sawyers.test",
    password: "oldharbour-slabs-2026",
    role: "sawyer",
    displayName: "Nadia Pettersen",
    yardName: "Old Harbour Sawyers",
    memberSince: "2023-08-02",
    story: "A shared workshop in the restored net sheds. Sycamore and coffeetree from the harbour streets, mulberry from the allotments.",
    pickupTown: "Lakemont",
    note: "sawyer, a shared workshop in the old harbour sheds",
  },
  {
    email: "hello@tamarack-lane.test",
    password: "tamarack-lane-2026",
    role: "sawyer",
    displayName: "Fenwick Adeyemi",
    yardName: "Tamarack Lane Slabs",
    memberSince: "2024-05-19",
    story:
      "A small backyard mill in East Lakemont, mostly fruit and nut trees from neighbours' gardens. Small batches, read by hand every month.",
    pickupTown: "East Lakemont",
    note: "sawyer, small backyard mill, mostly fruit and nut trees",
  },
  {
    email: "shop@fernhill-furniture.test",
    password: "fernhill-benches-2026",
    role: "buyer",
    displayName: "Fernhill Furniture Shop",
    note: "buyer, small furniture shop",
  },
  {
    email: "ana.theo@lakemont-home.test",
    password: "first-dining-table-26",
    role: "buyer",
    displayName: "Ana and Theo Brandt",
    note: "buyer, first dining table",
  },
  {
    email: "studio@calloway-interiors.test",
    password: "bookmatched-pair-2026",
    role: "buyer",
    displayName: "Ines Calloway",
    note: "buyer, interior designer",
  },
  {
    email: "sam@hollowpine-guitars.test",
    password: "hollowpine-tonewood-2026",
    role: "buyer",
    displayName: "Sam Achebe-Lund",
    note: "buyer, a two-bench guitar workshop",
  },
  {
    email: "bea.fennimore@lakemont-home.test",
    password: "bench-by-the-window-26",
    role: "buyer",
    displayName: "Beatrix Fennimore",
    note: "buyer, weekend woodworker",
  },
  {
    email: "corin@lakeview-fitout.test",
    password: "cafe-counter-2026",
    role: "buyer",
    displayName: "Corin Mbeki",
    note: "buyer, a shop-fitting contractor",
  },
  {
    email: "wendel.family@lakemont-home.test",
    password: "kitchen-island-top-26",
    role: "buyer",
    displayName: "Tomasz and Priya Wendel",
    note: "buyer, a kitchen island top",
  },
];

/** Adds the demo accounts that are missing; running it twice adds nothing twice. */
export async function seedLakemont(dataSource: DataSource, bcryptCost: number): Promise<{ created: number }> {
  let created = 0;
  await dataSource.transaction(async (manager) => {
    const repository = manager.getRepository(AccountEntity);
    for (const demo of demoAccounts) {
      const existing = await repository.findOneBy({ email: demo.email });
      if (existing) {
        // Accounts seeded before pickup towns were placed on the map get their position now.
        if (existing.pickupTown && existing.pickupLatitude === null)
          await repository.update({ id: existing.id }, pickupPosition(existing.pickupTown));
        // And yards seeded before yard pages get their story.
        if (demo.story && existing.yardStory === null) await repository.update({ id: existing.id }, { yardStory: demo.story });
        // A demo admin seeded before second factors gets one (but not one who removed theirs on purpose).
        if (
          existing.role === "admin" &&
          !existing.totpOnAt &&
          !(await manager.getRepository(AuditEntryEntity).existsBy({ targetId: existing.id, action: "second_factor.off" }))
        )
          await repository.update({ id: existing.id }, { totpSecret: newTotpSecret(), totpOnAt: new Date() });
        continue;
      }
      const id = randomUUID();
      await repository.insert({
        id,
        email: demo.email,
        passwordHash: await hashPassword(demo.password, bcryptCost),
        role: demo.role,
        displayName: demo.displayName,
        yardName: demo.yardName ?? null,
        yardSlug: demo.yardName ? await freeYardSlug(manager, demo.yardName, id) : null,
        yardStory: demo.story ?? null,
        pickupTown: demo.pickupTown ?? null,
        ...pickupPosition(demo.pickupTown ?? null),
        emailVerifiedAt: new Date(),
        // Admins need a second factor: the demo admin's secret is made here once, kept in the database, and
        // printed by `npm start` (never written into the repository).
        ...(demo.role === "admin" ? { totpSecret: newTotpSecret(), totpOnAt: new Date() } : {}),
      });
      // The database stamps created_at itself; a demo yard has been a member for a while.
      if (demo.memberSince) await repository.update({ id }, { createdAt: new Date(`${demo.memberSince}T15:00:00Z`) });
      created += 1;
    }
  });
  return { created };
}

import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import type { Role } from "@grainyard/contracts";
import { AccountEntity } from "../entities/index.ts";
import { pickupPosition } from "../services/account-service.ts";
import { hashPassword } from "../services/passwords.ts";

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
    pickupTown: "Lakemont",
    note: "sawyer, two-person band-mill yard",
  },
  {
    email: "hello@cobblelane-slabs.test",
    password: "cobblelane-chainsaw-2026",
    role: "sawyer",
    displayName: "Dana Okafor",
    yardName: "Cobble Lane Slabworks",
    pickupTown: "East Lakemont",
    note: "sawyer, chainsaw mill with the city's tree crews",
  },
  {
    email: "kiln@northshore-coop.test",
    password: "northshore-kiln-2026",
    role: "sawyer",
    displayName: "Priya Marchetti",
    yardName: "Northshore Kiln Co-op",
    pickupTown: "Northshore",
    note: "sawyer, shared kiln co-op",
  },
  {
    email: "mill@heronpoint-mill.test",
    password: "heronpoint-bandsaw-2026",
    role: "sawyer",
    displayName: "Tobias Reinholt",
    yardName: "Heron Point Mill",
    pickupTown: "Heron Point",
    note: "sawyer, portable band mill that follows the county park crews",
  },
  {
    email: "woodlot@cedarhollow.test",
    password: "cedarhollow-solar-kiln-2026",
    role: "sawyer",
    displayName: "Greta Solberg",
    yardName: "Cedar Hollow Woodlot",
    pickupTown: "Cedar Hollow",
    note: "sawyer, farm woodlot with a solar kiln",
  },
  {
    email: "barn@ashgrove-slabs.test",
    password: "ashgrove-barn-2026",
    role: "sawyer",
    displayName: "Wendell Okoro",
    yardName: "Ashgrove Slab Barn",
    pickupTown: "Ashgrove",
    note: "sawyer, a barn of ash and elm from the borer years",
  },
  {
    email: "crew@quarryridge-trees.test",
    password: "quarryridge-arborists-2026",
    role: "sawyer",
    displayName: "Rosalind Achterberg",
    yardName: "Quarry Ridge Tree & Timber",
    pickupTown: "Quarry Ridge",
    note: "sawyer, an arborist crew that mills its own removals",
  },
  {
    email: "office@millbrook-kiln.test",
    password: "millbrook-dehumidifier-2026",
    role: "sawyer",
    displayName: "Imre Castellanos",
    yardName: "Millbrook Kiln Works",
    pickupTown: "Millbrook",
    note: "sawyer, the region's biggest kiln",
  },
  {
    email: "dock@oldharbour-sawyers.test",
    password: "oldharbour-slabs-2026",
    role: "sawyer",
    displayName: "Nadia Pettersen",
    yardName: "Old Harbour Sawyers",
    pickupTown: "Lakemont",
    note: "sawyer, a shared workshop in the old harbour sheds",
  },
  {
    email: "hello@tamarack-lane.test",
    password: "tamarack-lane-2026",
    role: "sawyer",
    displayName: "Fenwick Adeyemi",
    yardName: "Tamarack Lane Slabs",
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
        continue;
      }
      await repository.insert({
        id: randomUUID(),
        email: demo.email,
        passwordHash: await hashPassword(demo.password, bcryptCost),
        role: demo.role,
        displayName: demo.displayName,
        yardName: demo.yardName ?? null,
        pickupTown: demo.pickupTown ?? null,
        ...pickupPosition(demo.pickupTown ?? null),
        emailVerifiedAt: new Date(),
      });
      created += 1;
    }
  });
  return { created };
}

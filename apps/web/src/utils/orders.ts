import { formatPickupWindow, orderStatusLabels, type Order, type OrderSlabSnapshot } from "@grainyard/contracts";
import { speciesName } from "./yard.ts";

export { orderStatusLabels };

/** "3F2A9C1B": the short order number people read out on the phone. */
export function orderNumber(order: Pick<Order, "id">): string {
  return order.id.slice(0, 8).toUpperCase();
}

const time = new Intl.DateTimeFormat("en", { hour: "2-digit", minute: "2-digit" });
const day = new Intl.DateTimeFormat("en", { dateStyle: "medium" });

/** A pickup window in the yard's time, whatever the reader's clock: "Sat 5 Dec, 9–11 am, yard time (America/Detroit)". */
export function windowLabel(window: { startsAt: string; endsAt: string }, order: Pick<Order, "pickupTimeZone">): string {
  return formatPickupWindow(window, order.pickupTimeZone);
}

type Reader = Order["viewerIs"];

/**
 * The pickup facts in words for the one reading them: the buyer is told what to do or what comes,
 * the sawyer likewise, and anyone else (an admin) reads about both in the third person.
 */
export function pickupFacts(
  order: Pick<Order, "viewerIs" | "chosenPickupWindow" | "pickupWindows" | "pickupTimeZone" | "pickupAddress" | "parties">,
): {
  yard: string;
  where: string;
  when: string;
} {
  const reader: Reader = order.viewerIs;
  const yard = order.parties.yardName ?? (reader === "sawyer" ? "Your yard" : "The sawyer's yard");
  const where =
    order.pickupAddress ??
    (reader === "sawyer" ? "You give the address with the pickup times." : "The sawyer gives the address with the pickup times.");
  let when: string;
  if (order.chosenPickupWindow) when = windowLabel(order.chosenPickupWindow, order);
  else if (order.pickupWindows.length)
    when =
      reader === "buyer"
        ? "Choose one of the sawyer's times above."
        : reader === "sawyer"
          ? "Waiting for the buyer to choose one of your times."
          : "The buyer has not chosen a time yet.";
  else
    when =
      reader === "sawyer"
        ? "Propose pickup times above."
        : reader === "buyer"
          ? "The sawyer will propose times soon; we'll e-mail you."
          : "The sawyer has not proposed times yet.";
  return { yard, where, when };
}

export function stampLabel(iso: string | null): string {
  return iso ? `${day.format(new Date(iso))}, ${time.format(new Date(iso))}` : "";
}

/** The slab as it was when ordered (the order's own snapshot), with the figures the order page shows. */
export interface SnapshotSlab {
  id: string;
  speciesSlug: string;
  sequenceInLog: number | null;
  lengthMm: number;
  thicknessMm: number;
  averageWidthMm: number;
  boardFeet: number;
  weightHighKg: number;
  handling: OrderSlabSnapshot["figures"]["handling"];
  species: string;
}

export function snapshotSlabs(order: Pick<Order, "slabs">): SnapshotSlab[] {
  return order.slabs.map(({ id, speciesSlug, sequenceInLog, lengthMm, thicknessMm, figures }) => ({
    id,
    speciesSlug,
    sequenceInLog,
    lengthMm,
    thicknessMm,
    averageWidthMm: figures.averageWidthMm,
    boardFeet: figures.boardFeet,
    weightHighKg: figures.weightHighKg,
    handling: figures.handling,
    species: speciesSlug ? speciesName(speciesSlug) : "Slab",
  }));
}

/** The heaviest handling any one slab needs (each slab is lifted on its own). */
export function worstHandling(slabs: SnapshotSlab[]): SnapshotSlab["handling"] {
  const rank = ["one_person", "two_people", "mechanical_aid"] as const;
  return slabs.reduce<SnapshotSlab["handling"]>(
    (worst, s) => (rank.indexOf(s.handling) > rank.indexOf(worst) ? s.handling : worst),
    "one_person",
  );
}

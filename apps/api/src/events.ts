import Emittery from "emittery";
import type { EntityManager } from "typeorm";

/**
 * Domain events: what one service announces and others act on, typed in one place instead of
 * callbacks wired by hand. Events that carry a `manager` are emitted inside the transaction that
 * made the change (with `emitSerial`), so a listener's writes commit or roll back with it.
 */
interface DomainEvents {
  /** A listing's state, price, figures or yard changed: the catalogue row follows. */
  listingChanged: { manager: EntityManager; listingId: string };
  /** A listing went live (after its transaction committed): saved-search alerts. */
  listingLive: { listingId: string };
  /** A yard's profile (name, pickup town) changed: its listings follow. */
  yardChanged: { manager: EntityManager; sawyerId: string };
  /** Slabs' computed figures changed: the listings that hold them follow. */
  slabFiguresChanged: { manager: EntityManager; slabIds: string[] };
  /** A yard's visible reviews changed: its rating on its catalogue rows follows. */
  yardRatingChanged: { manager: EntityManager; sawyerId: string };
}

export type DomainEventBus = Emittery<DomainEvents>;

export function createDomainEvents(): DomainEventBus {
  return new Emittery<DomainEvents>();
}

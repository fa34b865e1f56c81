import { describe, expect, it } from "vitest";
import type { ThreadSummary } from "@grainyard/contracts";
import { messageWhen, otherPartyName } from "./messages.ts";

const now = new Date("2026-12-02T15:00:00Z");

describe("message words", () => {
  it("says when a message was sent, in a few characters", () => {
    expect(messageWhen("2026-12-02T14:59:40Z", now)).toBe("just now");
    expect(messageWhen("2026-12-02T14:48:00Z", now)).toBe("12 min ago");
    expect(messageWhen("2026-11-03T09:00:00Z", now)).toBe("Nov 3");
    expect(messageWhen("2025-11-03T09:00:00Z", now)).toBe("Nov 3, 2025");
    expect(messageWhen("not a date", now)).toBe("not a date");
  });

  it("names the other person: the sawyer with the yard for a buyer, the buyer for a sawyer", () => {
    const thread = {
      myRole: "buyer",
      buyer: { id: "b", displayName: "Ana and Theo Brandt" },
      sawyer: { id: "s", displayName: "Oskar Lindqvist", yardName: "Ridgeback Urban Timber" },
      otherParty: { id: "s", displayName: "Oskar Lindqvist" },
    } as ThreadSummary;
    expect(otherPartyName(thread)).toBe("Oskar Lindqvist · Ridgeback Urban Timber");
    expect(otherPartyName({ ...thread, myRole: "sawyer", otherParty: thread.buyer })).toBe("Ana and Theo Brandt");
    expect(otherPartyName({ ...thread, myRole: "observer" })).toBe("Ana and Theo Brandt and Oskar Lindqvist");
  });
});

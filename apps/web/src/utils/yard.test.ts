import { describe, expect, it } from "vitest";
import type { ListingStatus } from "@grainyard/contracts";
import { isReadyToSell, yardStock } from "./yard.ts";

describe("the yard's stock", () => {
  it("does not count a sold or reserved slab as ready to sell (4 slabs, one of them sold: 3 ready, 1 sold)", () => {
    const slabs = [
      { id: "a", dryingState: "ready" as const },
      { id: "b", dryingState: "ready" as const },
      { id: "c", dryingState: "ready" as const },
      { id: "d", dryingState: "ready" as const },
    ];
    const statuses = new Map<string, ListingStatus>([
      ["a", "sold"],
      ["b", "live"],
    ]);
    expect(yardStock(slabs, (id) => statuses.get(id))).toEqual({ total: 4, readyToSell: 3, sold: 1 });
    statuses.set("c", "reserved");
    expect(yardStock(slabs, (id) => statuses.get(id))).toEqual({ total: 4, readyToSell: 2, sold: 1 });
  });

  it("counts only dry slabs as ready", () => {
    expect(isReadyToSell({ dryingState: "drying" }, null)).toBe(false);
    expect(isReadyToSell({ dryingState: "no_readings" }, "draft")).toBe(false);
    expect(isReadyToSell({ dryingState: "ready" }, "draft")).toBe(true);
    expect(isReadyToSell({ dryingState: "ready" }, "sold")).toBe(false);
  });
});

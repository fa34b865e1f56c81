import { describe, expect, it } from "vitest";
import { ApiRequestError } from "../api/errors.ts";
import { pageStateElement, parsePageState, serialisePageState } from "./state.ts";

describe("the page state data block", () => {
  const state = {
    site: { origin: "https://grainyard.test" },
    pinia: { units: { system: "imperial" }, favourites: { ids: new Set(["a"]) } },
    colada: {
      '["catalogue","listing","x"]': [undefined, new ApiRequestError(404, "not_found", "That slab is not for sale here."), 12, undefined],
      '["catalogue","listing","y"]': [{ title: "Walnut </script><script>alert(1)</script> & \u2028" }, null, 3, undefined],
    },
  };

  it("round-trips Sets, the API's errors and awkward text", () => {
    const back = parsePageState(serialisePageState(state));
    expect(back.site.origin).toBe("https://grainyard.test");
    expect((back.pinia.favourites as { ids: Set<string> }).ids).toEqual(new Set(["a"]));
    const [, error] = back.colada['["catalogue","listing","x"]'] as [unknown, ApiRequestError];
    expect(error).toBeInstanceOf(ApiRequestError);
    expect(error.status).toBe(404);
    expect(error.message).toBe("That slab is not for sale here.");
    const [data] = back.colada['["catalogue","listing","y"]'] as [{ title: string }];
    expect(data.title).toBe("Walnut </script><script>alert(1)</script> & \u2028");
  });

  it("never closes its script element early and is a JSON data block", () => {
    const element = pageStateElement(state);
    const inner = element.slice(element.indexOf(">") + 1, element.lastIndexOf("</script>"));
    expect(inner).not.toMatch(/<\/script/i);
    expect(inner).not.toContain("<");
    expect(element).toMatch(/^<script type="application\/json" id="grainyard-state">/);
    expect(typeof JSON.parse(inner)).toBe("string");
  });
});

import { describe, expect, it } from "vitest";
import { routeFiles } from "./route-size.ts";

describe("JavaScript loaded for a route", () => {
  it("takes the entry, the route's chunk and their static imports, not what loads later", () => {
    const bundle = {
      "index.js": { type: "chunk" as const, fileName: "index.js", isEntry: true, imports: ["vue.js"] },
      "vue.js": { type: "chunk" as const, fileName: "vue.js", imports: [] },
      "BrowseView.js": {
        type: "chunk" as const,
        fileName: "BrowseView.js",
        facadeModuleId: "/src/views/BrowseView.vue",
        imports: ["vue.js", "card.js"],
      },
      "card.js": { type: "chunk" as const, fileName: "card.js", imports: ["format.js"] },
      "format.js": { type: "chunk" as const, fileName: "format.js", imports: [] },
      "AdminHomeView.js": {
        type: "chunk" as const,
        fileName: "AdminHomeView.js",
        facadeModuleId: "/src/views/AdminHomeView.vue",
        imports: ["chart.js"],
      },
      "chart.js": { type: "chunk" as const, fileName: "chart.js", imports: [] },
      "style.css": { type: "asset" as const, fileName: "style.css" },
    };
    expect(routeFiles(bundle, /views\/BrowseView\.vue$/)).toEqual(["BrowseView.js", "card.js", "format.js", "index.js", "vue.js"]);
    expect(routeFiles(bundle, /views\/Missing\.vue$/)).toEqual([]);
  });
});

import { afterEach, describe, expect, it, vi } from "vitest";
import { mount } from "@vue/test-utils";
import { yardEndpoints } from "@grainyard/contracts";
import CsvErrorTable from "./CsvErrorTable.vue";
import { errorDetail, toApiRequestError } from "../../api/errors.ts";
import { transport } from "../../api/http.ts";
import { yardApi } from "../../api/yard.ts";

afterEach(() => {
  document.body.innerHTML = "";
  transport.useFetch(undefined);
  transport.useCsrfToken(() => null);
});

const rows = [
  { row: 2, field: "thicknessMm", message: "The thickness must be at least 10 mm." },
  { row: 4, field: "speciesSlug", message: "Choose the species from the list." },
];

describe("CSV import errors", () => {
  it("shows one table row per problem and says nothing was saved", () => {
    const wrapper = mount(CsvErrorTable, { props: { rows, message: "2 rows need fixing." } });
    expect(wrapper.text()).toContain("Nothing was saved.");
    expect(wrapper.text()).toContain("2 rows need fixing.");
    const cells = wrapper.findAll("tbody tr").map((tr) => tr.findAll("td").map((td) => td.text()));
    expect(cells).toEqual([
      ["2", "thicknessMm", "The thickness must be at least 10 mm."],
      ["4", "speciesSlug", "Choose the species from the list."],
    ]);
    expect(wrapper.find('[role="alert"]').exists()).toBe(true);
  });

  it("sends the file's text as text/csv and reads the row errors of a 422", async () => {
    const fetchMock = vi.fn(
      async () =>
        new Response(JSON.stringify({ error: { code: "csv_rows_invalid", message: "2 rows need fixing.", rows } }), { status: 422 }),
    );
    transport.useFetch(fetchMock as unknown as typeof fetch);
    transport.useCsrfToken(() => "tok");
    const error = toApiRequestError(
      await yardApi.importSlabsCsv({ body: "speciesSlug,lengthMm\nblack-walnut,2440\n" }).catch((caught: unknown) => caught),
    );
    expect(errorDetail(error, "csv_rows_invalid")?.rows).toEqual(rows);
    expect(error.message).toBe("2 rows need fixing.");
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe(yardEndpoints.importSlabsCsv.path);
    expect(init.method).toBe("POST");
    expect((init.headers as Record<string, string>)["content-type"]).toBe("text/csv");
    expect((init.headers as Record<string, string>)["x-csrf-token"]).toBe("tok");
    expect(init.body).toBe("speciesSlug,lengthMm\nblack-walnut,2440\n");
  });

  it("answers the number of slabs created", async () => {
    const fetchMock = vi.fn(async () => new Response(JSON.stringify({ created: 7 }), { status: 201 }));
    transport.useFetch(fetchMock as unknown as typeof fetch);
    await expect(yardApi.importSlabsCsv({ body: "a,b\n" })).resolves.toEqual({ created: 7 });
  });
});

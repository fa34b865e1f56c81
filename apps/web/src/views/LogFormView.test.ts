import { afterEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { createMemoryDraftStorage, useDraftStorage } from "../offline/draft-store.ts";
import { transport } from "../api/http.ts";
import { mountView, typeInto } from "../test/mount-view.ts";
import { sawyerAccount } from "../test/fixtures.ts";
import LogFormView from "./LogFormView.vue";

afterEach(() => {
  useDraftStorage(null);
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

/** Waits for a condition (the form keeps its draft after a short pause in the typing). */
async function until(condition: () => boolean) {
  for (let i = 0; i < 100 && !condition(); i++) await new Promise((resolve) => setTimeout(resolve, 20));
  expect(condition()).toBe(true);
}

describe("the new-log form", () => {
  it("keeps what was typed on this device, offers it back after a reload, and starts over on request", async () => {
    const storage = createMemoryDraftStorage();
    useDraftStorage(storage);
    const first = await mountView(LogFormView, { path: "/yard/logs/new", session: { account: sawyerAccount } });
    await typeInto(first.wrapper, "siteTown", "Lakemont");
    await typeInto(first.wrapper, "notes", "Storm-felled silver maple from the lakeside park.");
    await until(() => (storage.entries.get("log:new") as { notes?: string } | undefined)?.notes !== undefined);
    expect(storage.entries.get("log:new")).toMatchObject({
      siteTown: "Lakemont",
      notes: "Storm-felled silver maple from the lakeside park.",
    });
    first.wrapper.unmount();

    // The page opened again (a refresh): the typing is back, and said so.
    const second = await mountView(LogFormView, { path: "/yard/logs/new", session: { account: sawyerAccount } });
    await flushPromises();
    expect(second.wrapper.find('[data-test="log-draft-restored"]').exists()).toBe(true);
    expect((second.wrapper.find("#siteTown").element as HTMLInputElement).value).toBe("Lakemont");

    await second.wrapper.find('[data-test="log-draft-restored"] button').trigger("click");
    await flushPromises();
    expect((second.wrapper.find("#siteTown").element as HTMLInputElement).value).toBe("");
    expect(second.wrapper.find('[data-test="log-draft-restored"]').exists()).toBe(false);
  });
});

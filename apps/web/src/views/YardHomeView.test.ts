import { afterEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { accountEndpoints, listingEndpoints, pathOf, yardEndpoints } from "@grainyard/contracts";
import { transport } from "../api/http.ts";
import { mountView, typeInto } from "../test/mount-view.ts";
import { sawyerAccount } from "../test/fixtures.ts";
import YardHomeView from "./YardHomeView.vue";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const story = "Street trees from Lakemont's storm clean-ups, air-dried two summers, then kiln-finished.";

describe("the yard's home", () => {
  it("sends only the changed story with the yard details, shows it saved, and links the public yard page", async () => {
    const patch = `PATCH ${pathOf(accountEndpoints.updateYard, { sawyerId: sawyerAccount.id })}`;
    const { wrapper, fetchMock } = await mountView(YardHomeView, {
      path: "/yard",
      session: { account: { ...sawyerAccount, yardStory: null } },
      answers: {
        // Each list is asked again after the save (the yard changed).
        [`GET ${accountEndpoints.getOwnYard.path}`]: [
          { status: 200, body: { account: { ...sawyerAccount, yardStory: null } } },
          { status: 200, body: { account: { ...sawyerAccount, yardStory: story } } },
        ],
        [`GET ${yardEndpoints.listLogs.path}`]: [1, 2].map(() => ({ status: 200, body: { logs: [] } })),
        [`GET ${yardEndpoints.listSlabs.path}`]: [1, 2].map(() => ({ status: 200, body: { slabs: [] } })),
        [`GET ${listingEndpoints.listOwnListings.path}`]: [1, 2].map(() => ({ status: 200, body: { listings: [] } })),
        [patch]: [{ status: 200, body: { account: { ...sawyerAccount, yardStory: story } } }],
      },
    });
    expect(wrapper.find('[data-test="own-yard-page"]').attributes("href")).toBe("/yards/ridgeback-urban-timber");

    await typeInto(wrapper, "yardStory", story);
    await wrapper.find("form").trigger("submit");
    await flushPromises();

    const sent = fetchMock.mock.calls.find(([, init]) => init?.method === "PATCH");
    expect(JSON.parse(String(sent?.[1]?.body))).toEqual({ yardStory: story });
    expect(wrapper.text()).toContain("Saved. Your yard details are up to date.");
    expect((wrapper.find("#yardStory").element as HTMLTextAreaElement).value).toBe(story);
  });
});

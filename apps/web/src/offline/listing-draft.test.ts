import { afterEach, describe, expect, it, vi } from "vitest";
import { effectScope, nextTick } from "vue";
import type { Listing, ListingInput, ListingPhoto } from "@grainyard/contracts";
import { ApiRequestError } from "../api/errors.ts";
import { createMemoryDraftStorage } from "./draft-store.ts";
import { NEW_LISTING_KEY, newListingDraft, syncListingDraft, type ListingDraftFields, type ListingSyncApi } from "./listing-draft.ts";
import { useListingDraft } from "../composables/useListingDraft.ts";

const SLAB = "aaaaaaaa-0000-4000-8000-000000000002";
const offline = () => new ApiRequestError(0, "offline", "You seem to be offline.");

function listing(id: string, over: Partial<Listing> = {}): Listing {
  return {
    id,
    sawyerId: "acc_1",
    yardName: "Ridgeback Urban Timber",
    title: "Walnut slab",
    description: "",
    setKind: "single",
    priceMode: "per_board_foot",
    rateMinor: 1850,
    currency: "USD",
    pickup: true,
    freight: false,
    status: "draft",
    offersWelcome: false,
    offerFloorMinor: null,
    reviewNote: null,
    figures: {
      boardFeet: 1,
      volumeM3: 1,
      weightKg: 1,
      weightLowKg: 1,
      weightHighKg: 1,
      heavyLift: false,
      priceMinor: 1,
      platformFeeMinor: 0,
      processingFeeMinor: 0,
      sawyerNetMinor: 1,
    },
    slabs: [],
    photos: [],
    submittedAt: null,
    publishedAt: null,
    updatedAt: "2026-05-01T00:00:00.000Z",
    createdAt: "2026-05-01T00:00:00.000Z",
    ...over,
  };
}

/** A fake API that records every call and can be switched offline. */
function fakeApi() {
  const calls: string[] = [];
  let online = true;
  let photoCount = 0;
  const refuse = new Set<string>();
  const api: ListingSyncApi = {
    async createListing(input: ListingInput) {
      if (!online) throw offline();
      calls.push(`create ${input.title}`);
      return { listing: listing("lst_1", { title: input.title }) };
    },
    async updateListing(id: string, input: ListingInput) {
      if (!online) throw offline();
      calls.push(`update ${id} ${input.title}`);
      return { listing: listing(id, { title: input.title }) };
    },
    async uploadListingPhoto(id: string, file: Blob, options) {
      if (!online) throw offline();
      const name = await file.text();
      if (refuse.has(name)) throw new ApiRequestError(422, "not_an_image", "That file is not a photo we can read.");
      options?.onProgress?.(0.5);
      options?.onProgress?.(1);
      photoCount += 1;
      calls.push(`upload ${id} ${name} alt=${options?.altText ?? ""}`);
      const photo: ListingPhoto = {
        id: `ph_${photoCount}`,
        position: photoCount - 1,
        altText: options?.altText ?? "",
        width: 10,
        height: 10,
        smallUrl: `/s/${photoCount}`,
        mediumUrl: `/m/${photoCount}`,
        largeUrl: `/l/${photoCount}`,
      };
      return { photo };
    },
    async updatePhotoAltText(id: string, photoId: string, altText: string) {
      if (!online) throw offline();
      calls.push(`alt ${id} ${photoId} ${altText}`);
    },
    async setPhotoOrder(id: string, photoIds: string[]) {
      if (!online) throw offline();
      calls.push(`order ${id} ${photoIds.join(",")}`);
    },
    async deletePhoto(id: string, photoId: string) {
      if (!online) throw offline();
      calls.push(`delete ${id} ${photoId}`);
    },
  };
  return {
    api,
    calls,
    refuse,
    setOnline(value: boolean) {
      online = value;
    },
    isOnline: () => online,
  };
}

function validInput(fields: ListingDraftFields): ListingInput | null {
  if (fields.title.trim().length < 4 || fields.slabIds.length === 0 || !fields.priceMode) return null;
  return { title: fields.title, slabIds: fields.slabIds, priceMode: fields.priceMode, rateMinor: 1850 };
}

const photoFile = (name: string) => new File([name], `${name}.jpg`, { type: "image/jpeg" });

describe("syncListingDraft", () => {
  it("creates the listing, then uploads queued photos one by one in order, then sends the order", async () => {
    const fake = fakeApi();
    const draft = newListingDraft({ title: "Walnut slab", slabIds: [SLAB], priceMode: "per_board_foot", rate: "18.50" });
    draft.photos.push(
      {
        key: "a",
        serverId: null,
        blob: photoFile("first"),
        fileName: "first.jpg",
        altText: "Top face",
        altTextSynced: true,
        smallUrl: null,
        rejected: null,
      },
      {
        key: "b",
        serverId: null,
        blob: photoFile("second"),
        fileName: "second.jpg",
        altText: "",
        altTextSynced: true,
        smallUrl: null,
        rejected: null,
      },
    );
    const progress: [string, number][] = [];
    const result = await syncListingDraft(draft, {
      api: fake.api,
      toInput: validInput,
      onChange: () => undefined,
      onProgress: (key, value) => progress.push([key, value]),
      isOnline: fake.isOnline,
    });

    expect(result.status).toBe("synced");
    expect(fake.calls).toEqual([
      "create Walnut slab",
      "upload lst_1 first alt=Top face",
      "upload lst_1 second alt=",
      "order lst_1 ph_1,ph_2",
    ]);
    expect(draft.serverId).toBe("lst_1");
    expect(draft.key).toBe("listing:lst_1");
    expect(draft.photos.map((photo) => [photo.serverId, photo.blob])).toEqual([
      ["ph_1", null],
      ["ph_2", null],
    ]);
    expect(progress.filter(([key]) => key === "a").map(([, value]) => value)).toEqual([0, 0.5, 1, 1]);
  });

  it("stops where the connection was lost and carries on from there next time", async () => {
    const fake = fakeApi();
    const draft = newListingDraft({ title: "Walnut slab", slabIds: [SLAB], priceMode: "fixed", rate: "400" });
    draft.photos.push({
      key: "a",
      serverId: null,
      blob: photoFile("first"),
      fileName: "a",
      altText: "",
      altTextSynced: true,
      smallUrl: null,
      rejected: null,
    });
    fake.setOnline(false);
    // The browser thinks it is online, but the request fails: the client says "offline".
    const first = await syncListingDraft(draft, { api: fake.api, toInput: validInput, onChange: () => undefined, isOnline: () => true });
    expect(first.status).toBe("offline");
    expect(draft.serverId).toBeNull();
    expect(draft.fieldsPending).toBe(true);
    expect(draft.photos[0]!.blob).not.toBeNull();

    fake.setOnline(true);
    const second = await syncListingDraft(draft, {
      api: fake.api,
      toInput: validInput,
      onChange: () => undefined,
      isOnline: fake.isOnline,
    });
    expect(second.status).toBe("synced");
    expect(fake.calls).toEqual(["create Walnut slab", "upload lst_1 first alt=", "order lst_1 ph_1"]);
  });

  it("keeps the server's message on a refused photo and still uploads the others", async () => {
    const fake = fakeApi();
    fake.refuse.add("not-a-photo");
    const draft = newListingDraft({ title: "Walnut slab", slabIds: [SLAB], priceMode: "fixed", rate: "400" });
    draft.photos.push(
      {
        key: "a",
        serverId: null,
        blob: photoFile("not-a-photo"),
        fileName: "a",
        altText: "",
        altTextSynced: true,
        smallUrl: null,
        rejected: null,
      },
      {
        key: "b",
        serverId: null,
        blob: photoFile("good"),
        fileName: "b",
        altText: "",
        altTextSynced: true,
        smallUrl: null,
        rejected: null,
      },
    );
    const result = await syncListingDraft(draft, {
      api: fake.api,
      toInput: validInput,
      onChange: () => undefined,
      isOnline: fake.isOnline,
    });
    expect(result.status).toBe("synced");
    expect(draft.photos[0]!.rejected).toBe("That file is not a photo we can read.");
    expect(draft.photos[1]!.serverId).toBe("ph_1");
    // A refused photo is not sent again.
    fake.calls.length = 0;
    await syncListingDraft(draft, { api: fake.api, toInput: validInput, onChange: () => undefined, isOnline: fake.isOnline });
    expect(fake.calls.some((call) => call.startsWith("upload"))).toBe(false);
  });

  it("updates an existing listing and sends deletions and alt texts", async () => {
    const fake = fakeApi();
    const draft = newListingDraft({ title: "Walnut pair", slabIds: [SLAB], priceMode: "fixed", rate: "400" });
    draft.serverId = "lst_7";
    draft.photos.push({
      key: "ph_3",
      serverId: "ph_3",
      blob: null,
      fileName: "",
      altText: "Edge detail",
      altTextSynced: false,
      smallUrl: "/s",
      rejected: null,
    });
    draft.deletedPhotoIds.push("ph_2");
    draft.orderPending = true;
    const result = await syncListingDraft(draft, {
      api: fake.api,
      toInput: validInput,
      onChange: () => undefined,
      isOnline: fake.isOnline,
    });
    expect(result.status).toBe("synced");
    expect(fake.calls).toEqual(["update lst_7 Walnut pair", "delete lst_7 ph_2", "alt lst_7 ph_3 Edge detail", "order lst_7 ph_3"]);
    expect(draft.deletedPhotoIds).toEqual([]);
  });

  it("does not send an incomplete listing", async () => {
    const fake = fakeApi();
    const draft = newListingDraft({ title: "Wa" });
    const result = await syncListingDraft(draft, {
      api: fake.api,
      toInput: validInput,
      onChange: () => undefined,
      isOnline: fake.isOnline,
    });
    expect(result.status).toBe("incomplete");
    expect(fake.calls).toEqual([]);
  });
});

describe("useListingDraft", () => {
  afterEach(() => vi.useRealTimers());

  function open(storage = createMemoryDraftStorage(), fake = fakeApi()) {
    const scope = effectScope();
    const drafts = scope.run(() =>
      useListingDraft({ toInput: validInput, storage, api: fake.api, isOnline: fake.isOnline, debounceMs: 0, listen: false }),
    )!;
    return { drafts, storage, fake, scope };
  }

  it("says 'Saved on this phone' offline, queues the save, and syncs when back online", async () => {
    const { drafts, fake, storage } = open();
    fake.setOnline(false);
    await drafts.start(null, { slabIds: [SLAB] });
    drafts.draft.value!.fields.title = "Walnut slab";
    drafts.draft.value!.fields.priceMode = "per_board_foot";
    drafts.addPhotos([photoFile("first")]);
    await nextTick();

    const result = await drafts.save();
    expect(result.status).toBe("offline");
    expect(drafts.state.value).toBe("queued");
    expect(drafts.stateText.value).toBe("Saved on this phone — will sync when you're back online");
    const kept = await storage.get<{ saveQueued: boolean; photos: { blob: Blob | null }[] }>(NEW_LISTING_KEY);
    expect(kept?.saveQueued).toBe(true);
    expect(kept?.photos[0]?.blob).toBeInstanceOf(Blob);

    fake.setOnline(true);
    drafts.onOnline();
    await vi.waitFor(() => expect(drafts.state.value).toBe("synced"), { timeout: 10_000 });
    expect(drafts.stateText.value).toBe("Synced");
    expect(fake.calls).toEqual(["create Walnut slab", "upload lst_1 first alt=", "order lst_1 ph_1"]);
    // Everything reached the server: nothing is left on the phone.
    expect(storage.entries.size).toBe(0);
  });

  it("restores the whole draft after a reload, photos included", async () => {
    const storage = createMemoryDraftStorage();
    const first = open(storage);
    first.fake.setOnline(false);
    await first.drafts.start(null, { slabIds: [SLAB] });
    first.drafts.draft.value!.fields.title = "Bookmatched walnut";
    first.drafts.addPhotos([photoFile("one"), photoFile("two")]);
    first.drafts.movePhoto(first.drafts.draft.value!.photos[1]!.key, -1);
    first.drafts.setAltText(first.drafts.draft.value!.photos[0]!.key, "The second one, now first");
    await nextTick();
    await first.drafts.persistNow();
    first.scope.stop();

    const second = open(storage);
    second.fake.setOnline(false);
    await second.drafts.start(null, {});
    expect(second.drafts.restored.value).toBe(true);
    expect(second.drafts.draft.value!.fields.title).toBe("Bookmatched walnut");
    const photos = second.drafts.draft.value!.photos;
    expect(await Promise.all(photos.map((photo) => photo.blob!.text()))).toEqual(["two", "one"]);
    expect(photos[0]!.altText).toBe("The second one, now first");
    expect(second.drafts.stateText.value).toBe("Saved on this phone");
  });

  it("uploads a new photo at once when the listing already exists", async () => {
    const { drafts, fake } = open();
    await drafts.start(listing("lst_5", { slabs: [] }));
    expect(drafts.state.value).toBe("synced");
    drafts.addPhotos([photoFile("fresh")]);
    await vi.waitFor(() => expect(fake.calls).toContain("upload lst_5 fresh alt="), { timeout: 10_000 });
    expect(fake.calls.some((call) => call.startsWith("update"))).toBe(false);
  });

  it("keeps at most 12 photos", async () => {
    const { drafts, fake } = open();
    fake.setOnline(false);
    await drafts.start(null);
    const files = Array.from({ length: 14 }, (_, index) => photoFile(`p${index}`));
    expect(drafts.addPhotos(files)).toEqual({ added: 12, refused: 2 });
    expect(drafts.draft.value!.photos).toHaveLength(12);
  });
});

describe("useListingDraft: refused photos", () => {
  it("keeps a refused photo and its message on the phone after the listing is synced", async () => {
    const storage = createMemoryDraftStorage();
    const fake = fakeApi();
    fake.refuse.add("notes");
    const scope = effectScope();
    const drafts = scope.run(() =>
      useListingDraft({ toInput: validInput, storage, api: fake.api, isOnline: fake.isOnline, debounceMs: 0, listen: false }),
    )!;
    await drafts.start(null, { title: "Walnut slab", slabIds: [SLAB], priceMode: "fixed" });
    drafts.addPhotos([photoFile("good"), photoFile("notes")]);
    const result = await drafts.save();
    expect(result.status).toBe("synced");
    expect(drafts.state.value).toBe("synced");
    scope.stop();

    // The listing page opens the same draft: the good photo is up, the refused one still says why.
    const again = effectScope().run(() =>
      useListingDraft({ toInput: validInput, storage, api: fake.api, isOnline: fake.isOnline, debounceMs: 0, listen: false }),
    )!;
    await again.start(listing("lst_1"));
    expect(again.restored.value).toBe(false);
    expect(again.state.value).toBe("synced");
    expect(again.draft.value!.photos.map((photo) => photo.rejected)).toEqual([null, "That file is not a photo we can read."]);

    // Removing it leaves nothing worth keeping on the phone.
    again.removePhoto(again.draft.value!.photos[1]!.key);
    await again.persistNow();
    expect(storage.entries.size).toBe(0);
  });
});

describe("useListingDraft: retrying a failed photo", () => {
  it("sends a failed photo again when the sawyer asks, and it goes up once the server takes it", async () => {
    const storage = createMemoryDraftStorage();
    const fake = fakeApi();
    fake.refuse.add("flaky");
    const drafts = effectScope().run(() =>
      useListingDraft({ toInput: validInput, storage, api: fake.api, isOnline: fake.isOnline, debounceMs: 0, listen: false }),
    )!;
    await drafts.start(null, { title: "Walnut slab", slabIds: [SLAB], priceMode: "fixed" });
    drafts.addPhotos([photoFile("flaky")]);
    await drafts.save();
    const photo = () => drafts.draft.value!.photos[0]!;
    expect(photo().rejected).toBe("That file is not a photo we can read.");
    expect(photo().serverId).toBeNull();

    // The server would take it now: a retry clears the failure and uploads at once (the listing exists).
    fake.refuse.delete("flaky");
    drafts.retryPhoto(photo().key);
    expect(photo().rejected).toBeNull();
    expect(drafts.progress[photo().key]).toBe(0);
    await vi.waitFor(() => expect(photo().serverId).toBe("ph_1"), { timeout: 10_000 });
    expect(fake.calls).toContain("upload lst_1 flaky alt=");
  });
});

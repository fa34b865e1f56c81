import { computed, getCurrentScope, onScopeDispose, reactive, ref, toRaw, watch } from "vue";
import { MAX_PHOTOS_PER_LISTING, type Listing, type ListingInput } from "@grainyard/contracts";
import { listingsApi } from "../api/listings.ts";
import { draftStorage, type DraftStorage } from "../offline/draft-store.ts";
import {
  NEW_LISTING_KEY,
  draftFromListing,
  hasPendingWork,
  listingDraftKey,
  newListingDraft,
  syncListingDraft,
  type DraftPhoto,
  type ListingDraft,
  type ListingDraftFields,
  type ListingSyncApi,
  type SyncResult,
} from "../offline/listing-draft.ts";

/** The sync's calls, through the listings client. */
const defaultApi: ListingSyncApi = {
  createListing: (input) => listingsApi.createListing({ body: input }),
  updateListing: (listingId, input) => listingsApi.updateListing({ listingId, body: input }),
  uploadListingPhoto: (listingId, file, options = {}) =>
    listingsApi.uploadListingPhoto(
      { listingId, body: file, query: { altText: options.altText?.trim() || undefined } },
      { onProgress: options.onProgress, signal: options.signal },
    ),
  updatePhotoAltText: async (listingId, photoId, altText) => {
    await listingsApi.setPhotoAltText({ listingId, photoId, body: { altText } });
  },
  setPhotoOrder: async (listingId, photoIds) => {
    await listingsApi.setPhotoOrder({ listingId, body: { photoIds } });
  },
  deletePhoto: (listingId, photoId) => listingsApi.deleteListingPhoto({ listingId, photoId }),
};

export type DraftSyncState = "local" | "queued" | "syncing" | "synced" | "incomplete" | "failed";

const draftSyncLabels: Record<DraftSyncState, string> = {
  local: "Saved on this phone",
  queued: "Saved on this phone — will sync when you're back online",
  syncing: "Syncing…",
  synced: "Synced",
  incomplete: "Saved on this phone — fill in the marked fields, then save",
  failed: "Saved on this phone — not synced yet",
};

export interface ListingDraftOptions {
  /** The fields as the API takes them, or null when incomplete. */
  toInput(fields: ListingDraftFields): ListingInput | null;
  storage?: DraftStorage;
  api?: ListingSyncApi;
  debounceMs?: number;
  isOnline?(): boolean;
  /** Listen for the browser's `online` event (off in unit tests that drive it by hand). */
  listen?: boolean;
}

/** A copy IndexedDB can store: plain objects, the photo Blobs as they are. */
function storable(draft: ListingDraft): ListingDraft {
  const raw = toRaw(draft);
  return {
    ...raw,
    fields: { ...toRaw(raw.fields), slabIds: [...toRaw(raw.fields.slabIds)] },
    photos: toRaw(raw.photos).map((photo) => ({ ...toRaw(photo) })),
    deletedPhotoIds: [...toRaw(raw.deletedPhotoIds)],
  };
}

let photoCounter = 0;
function photoKey(): string {
  photoCounter += 1;
  return `local-${Date.now().toString(36)}-${photoCounter}-${Math.random().toString(36).slice(2, 8)}`;
}

/**
 * The listing form's whole state, kept on this phone in IndexedDB on every change (debounced),
 * restored after a reload, and sent to the API when there is a connection: at once when online,
 * otherwise queued until the browser says it is back online.
 */
export function useListingDraft(options: ListingDraftOptions) {
  const storage = options.storage ?? draftStorage();
  const client = options.api ?? defaultApi;
  const online = options.isOnline ?? (() => (typeof navigator === "undefined" ? true : navigator.onLine !== false));
  const debounceMs = options.debounceMs ?? 400;

  const draft = ref<ListingDraft | null>(null);
  const state = ref<DraftSyncState>("synced");
  const lastError = ref<string | null>(null);
  const restored = ref(false);
  const progress = reactive<Record<string, number>>({});
  const stateText = computed(() =>
    state.value === "failed" && lastError.value ? `${draftSyncLabels.failed}: ${lastError.value}` : draftSyncLabels[state.value],
  );

  let applying = false;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let running: Promise<SyncResult> | null = null;
  let previousKey: string | null = null;

  /** Worth keeping on the phone: unsent work, or a refused photo whose message must stay visible. */
  function worthKeeping(current: ListingDraft): boolean {
    return !current.serverId || current.saveQueued || hasPendingWork(current) || current.photos.some((photo) => photo.rejected);
  }

  async function persistNow() {
    clearTimeout(timer);
    const current = draft.value;
    if (!current) return;
    current.updatedAt = new Date().toISOString();
    if (worthKeeping(current)) await storage.put(current.key, storable(current));
    else await storage.delete(current.key);
    if (previousKey && previousKey !== current.key) {
      await storage.delete(previousKey);
    }
    previousKey = current.key;
  }

  function persistSoon() {
    clearTimeout(timer);
    timer = setTimeout(() => void persistNow(), debounceMs);
  }

  watch(
    () => draft.value?.fields,
    () => {
      if (applying || !draft.value) return;
      draft.value.fieldsPending = true;
      if (state.value !== "syncing") state.value = "local";
      persistSoon();
    },
    { deep: true },
  );

  function set(next: ListingDraft) {
    applying = true;
    draft.value = next;
    previousKey = next.key;
    // Let the fields watcher see the new object before changes count as edits.
    queueMicrotask(() => {
      applying = false;
    });
  }

  /**
   * Opens the draft: the one kept on this phone if there is one (it holds what the server has not
   * seen yet), else the server's listing, else a new one with `prefill`.
   */
  async function start(listing: Listing | null, prefill: Partial<ListingDraftFields> = {}, onlyStoredKey?: string): Promise<void> {
    const key = onlyStoredKey ?? (listing ? listingDraftKey(listing.id) : NEW_LISTING_KEY);
    const stored = await storage.get<ListingDraft>(key);
    if (stored && (hasPendingWork(stored) || stored.saveQueued || stored.photos.some((photo) => photo.rejected))) {
      set(stored);
      const unsent = stored.saveQueued || hasPendingWork(stored);
      restored.value = unsent;
      state.value = stored.saveQueued ? "queued" : unsent ? "local" : "synced";
      if (stored.saveQueued && online()) void sync();
      else if (stored.serverId && online() && hasPendingWork(stored) && !stored.fieldsPending) void sync({ photosOnly: true });
      return;
    }
    if (onlyStoredKey) return;
    restored.value = false;
    set(listing ? draftFromListing(listing) : newListingDraft(prefill));
    state.value = listing ? "synced" : "local";
  }

  /** Starts again from nothing (or from the server's copy): forgets what was kept on this phone. */
  async function discard(listing: Listing | null, prefill: Partial<ListingDraftFields> = {}) {
    if (draft.value) await storage.delete(draft.value.key);
    restored.value = false;
    set(listing ? draftFromListing(listing) : newListingDraft(prefill));
    state.value = listing ? "synced" : "local";
  }

  async function runSync(photosOnly: boolean): Promise<SyncResult> {
    const current = draft.value;
    if (!current) return { status: "incomplete" };
    if (!online()) {
      state.value = photosOnly && !current.saveQueued ? "local" : "queued";
      await persistNow();
      return { status: "offline" };
    }
    state.value = "syncing";
    lastError.value = null;
    const result = await syncListingDraft(
      current,
      {
        api: client,
        toInput: options.toInput,
        isOnline: online,
        onChange: () => persistNow(),
        onProgress: (key, fraction) => {
          progress[key] = fraction;
        },
      },
      { photosOnly },
    );
    switch (result.status) {
      case "synced":
        if (current.fieldsPending || current.saveQueued) state.value = current.saveQueued ? "queued" : "local";
        else state.value = hasPendingWork(current) ? "local" : "synced";
        if (state.value === "synced" && !worthKeeping(current)) {
          // The server has everything: nothing to keep on the phone.
          await storage.delete(current.key);
          previousKey = null;
        }
        break;
      case "offline":
        state.value = current.saveQueued ? "queued" : "local";
        break;
      case "incomplete":
        state.value = "incomplete";
        break;
      case "failed":
        state.value = "failed";
        lastError.value = result.error.message;
        break;
    }
    return result;
  }

  /** One sync at a time; a request during a sync runs once more after it. */
  async function sync(opts: { photosOnly?: boolean } = {}): Promise<SyncResult> {
    while (running) await running.catch(() => undefined);
    running = runSync(opts.photosOnly ?? false);
    try {
      return await running;
    } finally {
      running = null;
    }
  }

  /** The Save button: queue the save, and send it now if there is a connection. */
  async function save(): Promise<SyncResult> {
    const current = draft.value;
    if (!current) return { status: "incomplete" };
    current.saveQueued = true;
    await persistNow();
    return sync();
  }

  /** Photos go up at once when the listing already exists on the server; otherwise with the first save. */
  function photosChanged() {
    void persistNow();
    const current = draft.value;
    if (current?.serverId && online()) void sync({ photosOnly: true });
    else if (current && state.value === "synced") state.value = "local";
  }

  function addPhotos(files: readonly File[]): { added: number; refused: number } {
    const current = draft.value;
    if (!current) return { added: 0, refused: files.length };
    const room = Math.max(0, MAX_PHOTOS_PER_LISTING - current.photos.length);
    const accepted = files.slice(0, room);
    for (const file of accepted) {
      const photo: DraftPhoto = {
        key: photoKey(),
        serverId: null,
        blob: file,
        fileName: file.name,
        altText: "",
        altTextSynced: true,
        smallUrl: null,
        rejected: null,
      };
      current.photos.push(photo);
      progress[photo.key] = 0;
    }
    if (accepted.length) photosChanged();
    return { added: accepted.length, refused: files.length - accepted.length };
  }

  function removePhoto(key: string) {
    const current = draft.value;
    if (!current) return;
    const photo = current.photos.find((entry) => entry.key === key);
    if (!photo) return;
    current.photos = current.photos.filter((entry) => entry.key !== key);
    if (photo.serverId) current.deletedPhotoIds.push(photo.serverId);
    delete progress[key];
    photosChanged();
  }

  /** A photo whose upload failed goes up again (now, or with the first save). */
  function retryPhoto(key: string) {
    const photo = draft.value?.photos.find((entry) => entry.key === key);
    if (!photo?.rejected || !photo.blob) return;
    photo.rejected = null;
    progress[key] = 0;
    photosChanged();
  }

  function movePhoto(key: string, step: -1 | 1) {
    const current = draft.value;
    if (!current) return;
    const index = current.photos.findIndex((entry) => entry.key === key);
    const target = index + step;
    if (index < 0 || target < 0 || target >= current.photos.length) return;
    const photos = [...current.photos];
    [photos[index], photos[target]] = [photos[target]!, photos[index]!];
    current.photos = photos;
    current.orderPending = true;
    photosChanged();
  }

  function setAltText(key: string, altText: string) {
    const photo = draft.value?.photos.find((entry) => entry.key === key);
    if (!photo || photo.altText === altText) return;
    photo.altText = altText;
    if (photo.serverId) photo.altTextSynced = false;
    photosChanged();
  }

  /** After a submit or withdraw, take the server's copy as it is. */
  function adopt(listing: Listing) {
    const current = draft.value;
    if (current && hasPendingWork(current)) return;
    const next = draftFromListing(listing);
    // Refused photos stay on screen with their message until the sawyer removes them.
    next.photos.push(...(current?.photos.filter((photo) => photo.rejected) ?? []));
    set(next);
    state.value = "synced";
  }

  const onOnline = () => {
    const current = draft.value;
    if (!current) return;
    if (current.saveQueued) void sync();
    else if (current.serverId && hasPendingWork(current) && !current.fieldsPending) void sync({ photosOnly: true });
  };
  if (options.listen !== false && typeof window !== "undefined") {
    window.addEventListener("online", onOnline);
  }
  if (getCurrentScope()) {
    onScopeDispose(() => {
      if (typeof window !== "undefined") window.removeEventListener("online", onOnline);
      if (timer) {
        clearTimeout(timer);
        void persistNow();
      }
    });
  }

  return {
    draft,
    state,
    stateText,
    lastError,
    restored,
    progress,
    start,
    discard,
    save,
    sync,
    addPhotos,
    removePhoto,
    retryPhoto,
    movePhoto,
    setAltText,
    adopt,
    onOnline,
    persistNow,
  };
}

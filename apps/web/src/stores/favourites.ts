import { defineStore } from "pinia";
import { computed, ref, shallowRef, watch } from "vue";
import type { CatalogueCard } from "@grainyard/contracts";
import { useSessionStore } from "./session.ts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { buyerApi } from "../api/buyer.ts";

type LoadStatus = "idle" | "loading" | "ready" | "error";

/**
 * The signed-in buyer's favourite listings, shared by the catalogue cards, the slab page and the
 * favourites page. A toggle shows at once and is taken back if the API says no.
 */
export const useFavouritesStore = defineStore("favourites", () => {
  const session = useSessionStore();
  const ids = ref<Set<string>>(new Set());
  /** Cards of favourites that are still live, newest favourite first (the favourites page). */
  const cards = shallowRef<CatalogueCard[]>([]);
  const status = ref<LoadStatus>("idle");
  const loadError = ref<ApiRequestError | null>(null);
  /** Listings with a change on its way to the API (a second tap waits for it). */
  const pending = ref<Set<string>>(new Set());
  /** The last toggle that failed, to show beside its heart. */
  const failure = ref<{ listingId: string; message: string } | null>(null);
  let loading: Promise<void> | null = null;

  const count = computed(() => ids.value.size);
  const isFavourite = (listingId: string) => ids.value.has(listingId);
  const isPending = (listingId: string) => pending.value.has(listingId);

  function setId(listingId: string, on: boolean) {
    const next = new Set(ids.value);
    if (on) next.add(listingId);
    else next.delete(listingId);
    ids.value = next;
  }
  function setPending(listingId: string, on: boolean) {
    const next = new Set(pending.value);
    if (on) next.add(listingId);
    else next.delete(listingId);
    pending.value = next;
  }

  /** Reads the buyer's favourites (the cards and the ids). Concurrent calls share one request. */
  function load(): Promise<void> {
    if (loading) return loading;
    status.value = "loading";
    loadError.value = null;
    loading = buyerApi
      .listFavourites()
      .then(({ favourites }) => {
        cards.value = favourites;
        // A toggle still on its way keeps the state the buyer chose.
        const next = new Set(favourites.map((card) => card.listingId));
        for (const id of pending.value)
          if (ids.value.has(id)) next.add(id);
          else next.delete(id);
        ids.value = next;
        status.value = "ready";
      })
      .catch((error: unknown) => {
        loadError.value = toApiRequestError(error);
        status.value = "error";
      })
      .finally(() => {
        loading = null;
      });
    return loading;
  }

  /** Loads once for a buyer; nothing for anyone else. */
  function ensureLoaded(): Promise<void> {
    if (!session.isBuyer || status.value === "ready" || status.value === "loading") return loading ?? Promise.resolve();
    return load();
  }

  /**
   * Adds or removes one listing. The heart changes at once; on an error it goes back and
   * `failure` says why. `card` lets the favourites page show a new favourite without a reload.
   */
  async function toggle(listingId: string, card?: CatalogueCard): Promise<boolean> {
    if (pending.value.has(listingId)) return isFavourite(listingId);
    const wasOn = isFavourite(listingId);
    const on = !wasOn;
    failure.value = null;
    setId(listingId, on);
    setPending(listingId, true);
    try {
      if (on) await buyerApi.addFavourite({ listingId });
      else await buyerApi.removeFavourite({ listingId });
      if (on && card && !cards.value.some((c) => c.listingId === listingId)) cards.value = [card, ...cards.value];
      if (!on) cards.value = cards.value.filter((c) => c.listingId !== listingId);
      return on;
    } catch (error) {
      setId(listingId, wasOn);
      const problem = toApiRequestError(error);
      failure.value = {
        listingId,
        message: problem.status === 404 ? "This slab is no longer for sale, so it can't be saved." : problem.message,
      };
      return wasOn;
    } finally {
      setPending(listingId, false);
    }
  }

  function reset() {
    ids.value = new Set();
    cards.value = [];
    status.value = "idle";
    failure.value = null;
    loadError.value = null;
  }

  // Another person signing in on this device starts from nothing.
  watch(
    () => session.account?.id ?? null,
    (now, before) => {
      if (now !== before) reset();
    },
  );

  return { ids, cards, status, loadError, pending, failure, count, isFavourite, isPending, load, ensureLoaded, toggle, reset };
});

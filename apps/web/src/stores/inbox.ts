import { defineStore } from "pinia";
import { computed, ref, shallowRef, watch } from "vue";
import type { ThreadSummary } from "@grainyard/contracts";
import { useSessionStore } from "./session.ts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { messagesApi } from "../api/messages.ts";

/** How often the top bar asks for new messages while someone is signed in (ms). */
export const INBOX_POLL_MS = 30_000;

/** Unread counts of everything a buyer or sawyer talks about, behind the top bar's badge. */
export const useInboxStore = defineStore("inbox", () => {
  const session = useSessionStore();
  const threads = shallowRef<ThreadSummary[]>([]);
  const loaded = ref(false);
  const error = ref<ApiRequestError | null>(null);
  let pending: Promise<void> | null = null;

  /** Buyers and sawyers have conversations; admins only read them from the desk. */
  const hasInbox = computed(() => session.isBuyer || session.isSawyer);
  const unreadTotal = computed(() => threads.value.reduce((sum, thread) => sum + thread.unreadCount, 0));

  function refresh(): Promise<void> {
    if (!hasInbox.value) return Promise.resolve();
    if (pending) return pending;
    pending = messagesApi
      .listThreads()
      .then((answer) => {
        threads.value = answer.threads;
        loaded.value = true;
        error.value = null;
      })
      .catch((caught: unknown) => {
        error.value = toApiRequestError(caught);
      })
      .finally(() => {
        pending = null;
      });
    return pending;
  }

  /** The thread the reader just opened or wrote in: its summary replaces the old one. */
  function update(summary: ThreadSummary) {
    const others = threads.value.filter((thread) => thread.id !== summary.id);
    threads.value = [summary, ...others].sort((a, b) => b.lastMessageAt.localeCompare(a.lastMessageAt));
  }

  /** The reader's thread about a listing, if they asked about it before. */
  const threadAbout = (listingId: string) =>
    threads.value.find((thread) => thread.listingId === listingId && thread.myRole === "buyer") ?? null;

  watch(
    () => session.account?.id ?? null,
    (now, before) => {
      if (now === before) return;
      threads.value = [];
      loaded.value = false;
    },
  );

  return { threads, loaded, error, hasInbox, unreadTotal, refresh, update, threadAbout };
});

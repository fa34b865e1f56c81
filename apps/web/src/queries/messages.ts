/**
 * Conversations about listings: the reader's inbox (behind the top bar's unread badge and the
 * Messages page) and one thread. Sending updates both in the cache at once, so the badge, the
 * list and the thread agree without asking again.
 */
import { computed, toValue, type MaybeRefOrGetter } from "vue";
import { useMutation, useQuery, useQueryCache } from "@pinia/colada";
import { messageEndpoints, type MessagePosted, type ThreadDetail, type ThreadSummary } from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { useSessionStore } from "../stores/session.ts";
import { rethrow, useClient } from "./api.ts";
import { queryKeys } from "./keys.ts";
import { usePolledQuery } from "./polling.ts";

/** How often the top bar asks for new messages while someone is signed in (ms). */
export const INBOX_POLL_MS = 30_000;

function newestFirst(threads: ThreadSummary[]): ThreadSummary[] {
  return [...threads].sort((a, b) => b.lastMessageAt.localeCompare(a.lastMessageAt));
}

/** Puts a thread's newest summary into the reader's inbox in the cache (the one just opened or written in). */
function useInboxWriter() {
  const cache = useQueryCache();
  const session = useSessionStore();
  return (summary: ThreadSummary) => {
    const key = queryKeys.messages.threads(session.account?.id ?? "");
    const threads = cache.getQueryData<ThreadSummary[]>(key);
    if (!threads) return;
    cache.setQueryData(key, newestFirst([summary, ...threads.filter((thread) => thread.id !== summary.id)]));
  };
}

/**
 * The reader's conversations, newest first. Buyers and sawyers have an inbox; admins only read
 * conversations from the desk. With `pollMs`, asks again every so often while the page is in view.
 */
export function useInbox(options: { pollMs?: number } = {}) {
  const session = useSessionStore();
  const client = useClient(messageEndpoints);
  const hasInbox = computed(() => session.isBuyer || session.isSawyer);
  const query = useQuery<ThreadSummary[], ApiRequestError>({
    key: () => queryKeys.messages.threads(session.account?.id ?? ""),
    query: ({ signal }) =>
      client
        .listThreads(undefined, { signal })
        .then((answer) => answer.threads)
        .catch(rethrow),
    enabled: () => hasInbox.value,
    staleTime: 5_000,
  });
  if (options.pollMs) usePolledQuery(() => query.refetch(), options.pollMs, hasInbox);

  const threads = computed(() => (hasInbox.value ? (query.data.value ?? []) : []));
  return {
    hasInbox,
    threads,
    /** The first answer is in (an empty inbox is loaded too). */
    loaded: computed(() => query.data.value !== undefined),
    error: query.error,
    unreadTotal: computed(() => threads.value.reduce((sum, thread) => sum + thread.unreadCount, 0)),
    refresh: () => query.refetch(),
    update: useInboxWriter(),
    /** The reader's thread about a listing, if they asked about it before. */
    threadAbout: (listingId: string) => threads.value.find((thread) => thread.listingId === listingId && thread.myRole === "buyer") ?? null,
  };
}

/** One conversation; opening it marks the other side's messages read (the inbox learns the new count). */
export function useThread(threadId: MaybeRefOrGetter<string>, pollMs: number) {
  const client = useClient(messageEndpoints);
  const writeInbox = useInboxWriter();
  const query = useQuery<ThreadDetail, ApiRequestError>({
    key: () => queryKeys.messages.thread(toValue(threadId)),
    query: ({ signal }) =>
      client
        .getThread({ threadId: toValue(threadId) }, { signal })
        .then((answer) => {
          writeInbox(answer.thread);
          return answer;
        })
        .catch(rethrow),
    staleTime: 0,
  });
  usePolledQuery(() => query.refetch(), pollMs);
  return query;
}

/** Writes in a thread; the answer goes into the thread and the inbox in the cache. */
export function useReply(threadId: MaybeRefOrGetter<string>) {
  const client = useClient(messageEndpoints);
  const cache = useQueryCache();
  const writeInbox = useInboxWriter();
  return useMutation<MessagePosted, string, ApiRequestError>({
    mutation: (body) => client.replyInThread({ threadId: toValue(threadId), body: { body } }).catch(rethrow),
    onSuccess: (answer) => {
      const key = queryKeys.messages.thread(toValue(threadId));
      const detail = cache.getQueryData<ThreadDetail>(key);
      if (detail && !detail.messages.some((message) => message.id === answer.message.id)) {
        cache.setQueryData(key, { ...detail, thread: answer.thread, messages: [...detail.messages, answer.message] });
      }
      writeInbox(answer.thread);
    },
  });
}

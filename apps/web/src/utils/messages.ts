/** Small words for conversations: when a message was sent, and who the reader talks to. */
import type { ThreadSummary } from "@grainyard/contracts";

/** How often an open conversation looks for new messages (ms). */
export const THREAD_POLL_MS = 5_000;

const time = new Intl.DateTimeFormat("en", { hour: "2-digit", minute: "2-digit", hour12: false });
const dayMonth = new Intl.DateTimeFormat("en", { day: "numeric", month: "short" });
const fullDate = new Intl.DateTimeFormat("en", { day: "numeric", month: "short", year: "numeric" });

/** "just now", "12 min ago", "14:05" (earlier today), "3 Dec" (this year), "3 Dec 2025". */
export function messageWhen(iso: string, now: Date = new Date()): string {
  const at = new Date(iso);
  if (Number.isNaN(at.getTime())) return iso;
  const minutes = Math.floor((now.getTime() - at.getTime()) / 60_000);
  if (minutes < 1) return "just now";
  if (minutes < 60) return `${minutes} min ago`;
  if (at.toDateString() === now.toDateString()) return time.format(at);
  if (at.getFullYear() === now.getFullYear()) return dayMonth.format(at);
  return fullDate.format(at);
}

/** The other person's name, with the yard for a sawyer: "Oskar Lindqvist · Ridgeback Urban Timber". */
export function otherPartyName(thread: ThreadSummary): string {
  if (thread.myRole === "buyer") return [thread.sawyer.displayName, thread.sawyer.yardName].filter(Boolean).join(" · ");
  if (thread.myRole === "observer") return `${thread.buyer.displayName} and ${thread.sawyer.displayName}`;
  return thread.otherParty.displayName;
}

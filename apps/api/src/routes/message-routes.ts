import type { messageEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { MessageService } from "../services/message-service.ts";

/** Questions about a listing between a buyer and the sawyer. */
export function messageHandlers(messages: MessageService): Handlers<typeof messageEndpoints> {
  return {
    askAboutListing: ({ actor, params, body }) => messages.askAboutListing(actor, params.listingId, body),
    listThreads: async ({ actor }) => ({ threads: await messages.list(actor) }),
    getThread: ({ actor, params }) => messages.get(actor, params.threadId),
    replyInThread: ({ actor, params, body }) => messages.reply(actor, params.threadId, body),
  };
}

import { Router } from "express";
import { messageInputSchema } from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import type { MessageService } from "../services/message-service.ts";

/** Questions about a listing between a buyer and the sawyer. */
export function messageRoutes(messages: MessageService) {
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);
  router.post("/listings/:listingId/messages", async (req, res) => {
    res.status(201).json(await messages.askAboutListing(req.actor, id(req.params.listingId), parse(messageInputSchema, req.body)));
  });
  router.get("/threads", async (req, res) => {
    res.json({ threads: await messages.list(req.actor) });
  });
  router.get("/threads/:threadId", async (req, res) => {
    res.json(await messages.get(req.actor, id(req.params.threadId)));
  });
  router.post("/threads/:threadId/messages", async (req, res) => {
    res.status(201).json(await messages.reply(req.actor, id(req.params.threadId), parse(messageInputSchema, req.body)));
  });
  return router;
}

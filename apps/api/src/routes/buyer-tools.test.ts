import sharp from "sharp";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SavedSearchEntity } from "../entities/index.ts";
import type { SavedSearchService } from "../services/saved-search-service.ts";
import { unsubscribeToken } from "../services/saved-search-service.ts";
import { createTestContext, mailTo, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/** Saved searches with daily alerts, favourites and messages, through the real stack (MariaDB, SMTP sink). */
type Client = BrowserClient & { account: { id: string; email: string } };

const clock = testClock();
let ctx: TestContext;
let admin: Client;
let sawyer: Client;
let otherSawyer: Client;
let photo: Buffer;
const DAY = 24 * 3600_000;

const slabBase = {
  lengthMm: 2400,
  thicknessMm: 57,
  widthStationsMm: [800, 780, 760],
  liveEdge: "both",
  surfacing: "flattened",
  dryingMethod: "kiln",
};

/** A listing of one slab by `owner`, with a photo; submitted and approved unless told to stop earlier. */
async function listing(owner: BrowserClient, title: string, speciesSlug: string, stage: "draft" | "live" = "live"): Promise<string> {
  const slab = await owner.post("/api/v1/yard/slabs", { ...slabBase, speciesSlug });
  if (slab.status !== 201) throw new Error(JSON.stringify(slab.body));
  const made = await owner.post("/api/v1/yard/listings", { title, slabIds: [slab.body.slab.id], priceMode: "fixed", rateMinor: 90_000 });
  if (made.status !== 201) throw new Error(JSON.stringify(made.body));
  const id = made.body.listing.id as string;
  if (stage === "draft") return id;
  const uploaded = await owner.agent
    .post(`/api/v1/yard/listings/${id}/photos?altText=${encodeURIComponent(title)}`)
    .set("x-csrf-token", owner.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  if (uploaded.status !== 201) throw new Error(JSON.stringify(uploaded.body));
  const submitted = await owner.post(`/api/v1/yard/listings/${id}/submit`);
  if (submitted.status !== 200) throw new Error(JSON.stringify(submitted.body));
  const approved = await admin.post(`/api/v1/admin/listings/${id}/approve`);
  if (approved.status !== 200) throw new Error(JSON.stringify(approved.body));
  return id;
}

const buyer = () => ctx.signedInClient("buyer", { displayName: `Buyer ${Math.random().toString(36).slice(2, 6)}` }) as Promise<Client>;
const alertsService = (): SavedSearchService => ctx.app.savedSearches;
const slabLinks = (text: string) => [...text.matchAll(/\/slabs\/([0-9a-f-]{36})/g)].map((m) => m[1]);

beforeAll(async () => {
  ctx = await createTestContext({ clock });
  photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#7b4a2a" } })
    .jpeg()
    .toBuffer();
  admin = (await ctx.signedInClient("admin")) as Client;
  sawyer = (await ctx.signedInClient("sawyer", { displayName: "Rosa Ferreira", yardName: "Ridgeback Urban Timber" })) as Client;
  otherSawyer = (await ctx.signedInClient("sawyer")) as Client;
}, 60_000);
afterAll(async () => ctx?.close());

describe("saved searches", () => {
  it("saves a normalised query (no cursor, sort, limit or unknown keys), lists, renames, switches alerts, deletes", async () => {
    const owner = await buyer();
    const created = await owner.post("/api/v1/saved-searches", {
      name: "Walnut for eight",
      query: "?seats=8&species=black-walnut&sort=price_low&cursor=abc&limit=5&colour=red&ready=",
      alerts: true,
    });
    expect(created.status).toBe(201);
    const saved = created.body.savedSearch;
    expect(saved).toMatchObject({
      name: "Walnut for eight",
      query: "species=black-walnut&seats=8",
      alerts: true,
      lastAlertAt: null,
      pendingMatches: 0,
    });
    // The stored query runs as it is in the catalogue.
    expect((await request(ctx.app).get(`/api/v1/catalogue?${saved.query}`)).status).toBe(200);

    const second = await owner.post("/api/v1/saved-searches", { name: "Any oak", query: "species=white-oak,northern-red-oak" });
    expect(second.body.savedSearch.alerts).toBe(true);
    const list = await owner.get("/api/v1/saved-searches");
    expect(list.status).toBe(200);
    expect(list.body.savedSearches.map((s: { id: string }) => s.id).sort()).toEqual([saved.id, second.body.savedSearch.id].sort());

    const renamed = await owner.patch(`/api/v1/saved-searches/${saved.id}`, { name: "Dining walnut" });
    expect(renamed.body.savedSearch).toMatchObject({ name: "Dining walnut", alerts: true, query: saved.query });
    const quiet = await owner.patch(`/api/v1/saved-searches/${saved.id}`, { alerts: false });
    expect(quiet.body.savedSearch).toMatchObject({ name: "Dining walnut", alerts: false });

    const stranger = await buyer();
    expect((await stranger.patch(`/api/v1/saved-searches/${saved.id}`, { name: "Mine now" })).status).toBe(403);
    expect((await stranger.delete(`/api/v1/saved-searches/${saved.id}`)).status).toBe(403);
    expect((await stranger.get("/api/v1/saved-searches")).body.savedSearches).toEqual([]);

    expect((await owner.delete(`/api/v1/saved-searches/${saved.id}`)).status).toBe(204);
    expect((await owner.get("/api/v1/saved-searches")).body.savedSearches.map((s: { id: string }) => s.id)).toEqual([
      second.body.savedSearch.id,
    ]);
    expect((await owner.delete(`/api/v1/saved-searches/${saved.id}`)).status).toBe(404);
    expect((await owner.patch(`/api/v1/saved-searches/${saved.id}`, { alerts: true })).status).toBe(404);
  });

  it("refuses a query the catalogue would refuse, with the field under query.", async () => {
    const owner = await buyer();
    const cases: [string, string][] = [
      ["seats=1", "query.seats"],
      ["species=unobtainium", "query.species"],
      ["lengthMin=3000&lengthMax=2000", "query.lengthMin"],
      ["features=glitter", "query.features"],
      ["radiusKm=20", "query.radiusKm"],
      ["near=Atlantis%20under%20the%20sea", "query.near"],
      ["priceMax=lots", "query.priceMax"],
    ];
    for (const [query, field] of cases) {
      const res = await owner.post("/api/v1/saved-searches", { name: "Bad", query });
      expect(res.status, query).toBe(422);
      expect(
        Object.keys(res.body.error.fields).some((key) => key === field || key.startsWith(`${field}.`)),
        `${query}: ${JSON.stringify(res.body.error.fields)}`,
      ).toBe(true);
    }
    const noName = await owner.post("/api/v1/saved-searches", { name: "  ", query: "species=black-walnut" });
    expect(noName.status).toBe(422);
    expect(noName.body.error.fields).toHaveProperty("name");
    const id = (await owner.post("/api/v1/saved-searches", { name: "Fine", query: "species=black-walnut", alerts: false })).body.savedSearch
      .id;
    expect((await owner.patch(`/api/v1/saved-searches/${id}`, {})).status).toBe(422);
    expect((await owner.patch(`/api/v1/saved-searches/${id}`, { alerts: "yes" })).status).toBe(422);
    expect((await owner.get("/api/v1/saved-searches")).body.savedSearches).toHaveLength(1);
  });

  it("mails a matching search when a listing goes live, at most once a day; the rest waits for the next day", async () => {
    const walnutFan = await buyer();
    const oakFan = await buyer();
    const quietFan = await buyer();
    const watch = (
      await walnutFan.post("/api/v1/saved-searches", { name: "Walnut watch", query: "species=black-walnut&thicknessMin=50", alerts: true })
    ).body.savedSearch;
    await oakFan.post("/api/v1/saved-searches", { name: "Oak", query: "species=white-oak", alerts: true });
    await quietFan.post("/api/v1/saved-searches", { name: "Walnut, no mail", query: "species=black-walnut", alerts: false });

    const first = await listing(sawyer, "Walnut slab, first", "black-walnut");
    const walnutMail = await mailTo(walnutFan.account.email);
    expect(walnutMail).toHaveLength(1);
    expect(walnutMail[0]!.subject).toContain("Walnut watch");
    expect(slabLinks(walnutMail[0]!.text)).toEqual([first]);
    expect(walnutMail[0]!.text).toContain(`${ctx.config.publicUrl}/slabs/${first}`);
    expect(walnutMail[0]!.text).toContain(`${ctx.config.publicUrl}/api/v1/saved-searches/unsubscribe?token=`);
    expect(await mailTo(oakFan.account.email)).toHaveLength(0);
    expect(await mailTo(quietFan.account.email)).toHaveLength(0);
    const afterFirst = (await walnutFan.get("/api/v1/saved-searches")).body.savedSearches[0];
    expect(Math.abs(new Date(afterFirst.lastAlertAt).getTime() - clock.now().getTime())).toBeLessThan(60_000);

    // Within 24 hours: recorded, not mailed.
    clock.advance(2 * 3600_000);
    const second = await listing(sawyer, "Walnut slab, second", "black-walnut");
    expect(await mailTo(walnutFan.account.email)).toHaveLength(1);
    expect((await walnutFan.get("/api/v1/saved-searches")).body.savedSearches[0].pendingMatches).toBe(1);
    expect(await alertsService().processPendingAlerts(clock.now())).toEqual({ sent: 0 });
    expect(await mailTo(walnutFan.account.email)).toHaveLength(1);

    // A thin walnut slab does not match thicknessMin=50, an oak one goes to the oak search only.
    const thinSlab = await sawyer.post("/api/v1/yard/slabs", { ...slabBase, speciesSlug: "black-walnut", thicknessMm: 30 });
    const thin = await sawyer.post("/api/v1/yard/listings", {
      title: "Thin walnut",
      slabIds: [thinSlab.body.slab.id],
      priceMode: "fixed",
      rateMinor: 10_000,
    });
    await sawyer.agent
      .post(`/api/v1/yard/listings/${thin.body.listing.id}/photos?altText=thin`)
      .set("x-csrf-token", sawyer.csrfToken)
      .set("content-type", "image/jpeg")
      .send(photo);
    await sawyer.post(`/api/v1/yard/listings/${thin.body.listing.id}/submit`);
    await admin.post(`/api/v1/admin/listings/${thin.body.listing.id}/approve`);
    const oak = await listing(sawyer, "White oak slab", "white-oak");
    expect(slabLinks((await mailTo(oakFan.account.email))[0]!.text)).toEqual([oak]);
    expect((await walnutFan.get("/api/v1/saved-searches")).body.savedSearches[0].pendingMatches).toBe(1);

    // A day after the first alert: the pending match goes out, alone, once.
    clock.advance(DAY - 2 * 3600_000 + 60_000);
    const dayLater = clock.now();
    // (Other tests' saved searches may have due alerts too: count this buyer's mail, not the total.)
    expect((await alertsService().processPendingAlerts(dayLater)).sent).toBeGreaterThanOrEqual(1);
    const mails = await mailTo(walnutFan.account.email);
    expect(mails).toHaveLength(2);
    expect(slabLinks(mails[0]!.text)).toEqual([second]);
    expect(await alertsService().processPendingAlerts(clock.now())).toEqual({ sent: 0 });
    expect(await mailTo(walnutFan.account.email)).toHaveLength(2);
    const settled = (await walnutFan.get("/api/v1/saved-searches")).body.savedSearches[0];
    expect(settled).toMatchObject({ id: watch.id, pendingMatches: 0, lastAlertAt: dayLater.toISOString() });
    expect(await mailTo(quietFan.account.email)).toHaveLength(0);

    // The approval hook sends a due batch too: the next walnut waits, then any approval a day later carries it.
    const third = await listing(sawyer, "Walnut slab, third", "black-walnut");
    expect(await mailTo(walnutFan.account.email)).toHaveLength(2);
    clock.advance(DAY + 60_000);
    await listing(otherSawyer, "Cherry slab", "black-cherry");
    const latest = await mailTo(walnutFan.account.email);
    expect(latest).toHaveLength(3);
    expect(slabLinks(latest[0]!.text)).toEqual([third]);
  }, 120_000);

  it("turns alerts off from the mailed link without signing in; a changed token is refused", async () => {
    const owner = await buyer();
    const search = (await owner.post("/api/v1/saved-searches", { name: "Cherry <b>tops</b>", query: "species=black-cherry" })).body
      .savedSearch;
    clock.advance(DAY + 60_000); // clear of earlier tests' alert windows
    const live = await listing(sawyer, "Cherry for the link test", "black-cherry");
    const [mail] = await mailTo(owner.account.email);
    expect(slabLinks(mail!.text)).toEqual([live]);
    const link = /\/api\/v1\/saved-searches\/unsubscribe\?token=[^\s]+/.exec(mail!.text)![0];
    const token = decodeURIComponent(new URL(link, "http://x").searchParams.get("token")!);
    expect(token).toBe(unsubscribeToken(ctx.config.sessionSecret, search.id));

    const tampered = `${token.slice(0, -2)}${token.endsWith("AA") ? "BB" : "AA"}`;
    const refused = await request(ctx.app).get(`/api/v1/saved-searches/unsubscribe?token=${encodeURIComponent(tampered)}`);
    expect(refused.status).toBe(400);
    expect(refused.type).toBe("text/html");
    expect(refused.text).toContain("unsubscribe link is not valid");
    const otherId = await request(ctx.app).get(
      `/api/v1/saved-searches/unsubscribe?token=${encodeURIComponent(`${crypto.randomUUID()}.${token.split(".")[1]}`)}`,
    );
    expect(otherId.status).toBe(400);
    expect((await request(ctx.app).get("/api/v1/saved-searches/unsubscribe")).status).toBe(400);
    expect((await ctx.dataSource.getRepository(SavedSearchEntity).findOneByOrFail({ id: search.id })).alerts).toBe(true);

    const page = await request(ctx.app).get(link); // no cookie, no session
    expect(page.status).toBe(200);
    expect(page.type).toBe("text/html");
    expect(page.text).toContain("Alerts for “Cherry &lt;b&gt;tops&lt;/b&gt;” are off");
    expect((await owner.get("/api/v1/saved-searches")).body.savedSearches[0].alerts).toBe(false);
    // Once off, a new cherry brings no mail.
    clock.advance(DAY + 60_000);
    await listing(sawyer, "Another cherry", "black-cherry");
    expect(await mailTo(owner.account.email)).toHaveLength(1);
    // Following the link again is harmless; after deleting the search it says so.
    expect((await request(ctx.app).get(link)).status).toBe(200);
    await owner.delete(`/api/v1/saved-searches/${search.id}`);
    const gone = await request(ctx.app).get(link);
    expect(gone.status).toBe(404);
    expect(gone.text).toContain("deleted");
  }, 60_000);
});

describe("favourites", () => {
  let walnut: string;
  let maple: string;
  let draft: string;
  beforeAll(async () => {
    walnut = await listing(sawyer, "Favourite walnut", "black-walnut");
    maple = await listing(sawyer, "Favourite maple", "silver-maple");
    draft = await listing(sawyer, "Draft maple", "silver-maple", "draft");
  }, 60_000);

  it("keeps live listings once, newest first, with the catalogue's own card", async () => {
    const fan = await buyer();
    const first = await fan.agent.put(`/api/v1/favourites/${walnut}`).set("x-csrf-token", fan.csrfToken);
    expect(first.status).toBe(200);
    expect(first.body.favourite.listingId).toBe(walnut);
    clock.advance(1000);
    const again = await fan.agent.put(`/api/v1/favourites/${walnut}`).set("x-csrf-token", fan.csrfToken);
    expect(again.status).toBe(200);
    expect(again.body.favourite.createdAt).toBe(first.body.favourite.createdAt);
    clock.advance(1000);
    expect((await fan.agent.put(`/api/v1/favourites/${maple}`).set("x-csrf-token", fan.csrfToken)).status).toBe(200);

    const list = await fan.get("/api/v1/favourites");
    expect(list.status).toBe(200);
    expect(list.body.favourites.map((c: { listingId: string }) => c.listingId)).toEqual([maple, walnut]);
    const fromCatalogue = (await request(ctx.app).get("/api/v1/catalogue?species=black-walnut&limit=60")).body.results.find(
      (c: { listingId: string }) => c.listingId === walnut,
    );
    expect(list.body.favourites[1]).toEqual(fromCatalogue);

    // Someone else's favourites are their own.
    expect((await (await buyer()).get("/api/v1/favourites")).body.favourites).toEqual([]);
  });

  it("answers 404 for listings that are not live, and drops withdrawn ones from the list", async () => {
    const fan = await buyer();
    expect((await fan.agent.put(`/api/v1/favourites/${draft}`).set("x-csrf-token", fan.csrfToken)).status).toBe(404);
    expect((await fan.agent.put(`/api/v1/favourites/${crypto.randomUUID()}`).set("x-csrf-token", fan.csrfToken)).status).toBe(404);
    const goingAway = await listing(sawyer, "Soon withdrawn", "black-walnut");
    expect((await fan.agent.put(`/api/v1/favourites/${goingAway}`).set("x-csrf-token", fan.csrfToken)).status).toBe(200);
    expect((await fan.agent.put(`/api/v1/favourites/${walnut}`).set("x-csrf-token", fan.csrfToken)).status).toBe(200);
    expect((await fan.get("/api/v1/favourites")).body.favourites).toHaveLength(2);
    expect((await sawyer.post(`/api/v1/yard/listings/${goingAway}/withdraw`)).status).toBe(200);
    expect((await fan.get("/api/v1/favourites")).body.favourites.map((c: { listingId: string }) => c.listingId)).toEqual([walnut]);
    expect((await fan.agent.put(`/api/v1/favourites/${goingAway}`).set("x-csrf-token", fan.csrfToken)).status).toBe(404);
  });

  it("removes idempotently", async () => {
    const fan = await buyer();
    await fan.agent.put(`/api/v1/favourites/${walnut}`).set("x-csrf-token", fan.csrfToken);
    expect((await fan.delete(`/api/v1/favourites/${walnut}`)).status).toBe(204);
    expect((await fan.delete(`/api/v1/favourites/${walnut}`)).status).toBe(204);
    expect((await fan.get("/api/v1/favourites")).body.favourites).toEqual([]);
  });
});

describe("messages about a listing", () => {
  let walnut: string;
  let asker: Client;
  let threadId: string;
  beforeAll(async () => {
    walnut = await listing(sawyer, "Walnut to ask about", "black-walnut");
    asker = (await ctx.signedInClient("buyer", { displayName: "Ada Moreno" })) as Client;
  }, 60_000);

  const threadsOf = async (client: BrowserClient) =>
    (await client.get("/api/v1/threads")).body.threads as {
      id: string;
      unreadCount: number;
      listingTitle: string;
      otherParty: { displayName: string };
      lastMessage: { excerpt: string; fromMe: boolean } | null;
      myRole: string;
    }[];

  it("a buyer asks, the sawyer is told by e-mail; a second question continues the same thread", async () => {
    const asked = await asker.post(`/api/v1/listings/${walnut}/messages`, {
      body: "Is this slab still available?\nCould I see it on Saturday?",
    });
    expect(asked.status).toBe(201);
    threadId = asked.body.thread.id;
    expect(asked.body.thread).toMatchObject({
      listingId: walnut,
      listingTitle: "Walnut to ask about",
      myRole: "buyer",
      otherParty: { id: sawyer.account.id, displayName: "Rosa Ferreira" },
      unreadCount: 0,
    });
    expect(asked.body.message).toMatchObject({ fromMe: true, authorId: asker.account.id, authorName: "Ada Moreno", readAt: null });
    const [notice] = await mailTo(sawyer.account.email).then((all) => all.filter((m) => m.subject.includes("Walnut to ask about")));
    expect(notice!.subject).toContain("Ada Moreno");
    expect(notice!.text).toContain(`${ctx.config.publicUrl}/messages/${threadId}`);
    expect(notice!.text).toContain("Is this slab still available? Could I see it on Saturday?");

    const again = await asker.post(`/api/v1/listings/${walnut}/messages`, { body: "And is it kiln dried?" });
    expect(again.status).toBe(201);
    expect(again.body.thread.id).toBe(threadId);
    expect((await threadsOf(asker)).map((t) => t.id)).toEqual([threadId]);
  });

  it("the sawyer sees two unread, reads them, answers; the buyer is told and reads the answer", async () => {
    const before = (await threadsOf(sawyer)).find((t) => t.id === threadId)!;
    expect(before).toMatchObject({
      unreadCount: 2,
      myRole: "sawyer",
      otherParty: { displayName: "Ada Moreno" },
      lastMessage: { excerpt: "And is it kiln dried?", fromMe: false },
    });
    const opened = await sawyer.get(`/api/v1/threads/${threadId}`);
    expect(opened.status).toBe(200);
    expect(opened.body.messages.map((m: { body: string }) => m.body)).toEqual([
      "Is this slab still available?\nCould I see it on Saturday?",
      "And is it kiln dried?",
    ]);
    expect(opened.body.thread.unreadCount).toBe(0);
    expect((await threadsOf(sawyer)).find((t) => t.id === threadId)!.unreadCount).toBe(0);

    const buyerMailsBefore = (await mailTo(asker.account.email)).length;
    const answer = await sawyer.post(`/api/v1/threads/${threadId}/messages`, { body: "Yes, kiln dried to 8 %. Saturday at ten works." });
    expect(answer.status).toBe(201);
    expect(answer.body.message).toMatchObject({ fromMe: true, authorId: sawyer.account.id });
    const buyerMails = await mailTo(asker.account.email);
    expect(buyerMails).toHaveLength(buyerMailsBefore + 1);
    expect(buyerMails[0]!.subject).toContain("Walnut to ask about");
    expect(buyerMails[0]!.text).toContain(`/messages/${threadId}`);

    expect((await threadsOf(asker))[0]).toMatchObject({ id: threadId, unreadCount: 1, lastMessage: { fromMe: false } });
    // The buyer's first messages show as read by the sawyer.
    const buyerView = await asker.get(`/api/v1/threads/${threadId}`);
    expect(buyerView.body.messages.slice(0, 2).every((m: { readAt: string | null }) => m.readAt !== null)).toBe(true);
    expect(buyerView.body.thread.unreadCount).toBe(0);
    expect((await threadsOf(asker))[0]!.unreadCount).toBe(0);
  });

  it("only the two of them and admins read; admins do not write, and their reading marks nothing", async () => {
    const stranger = await buyer();
    expect((await stranger.get(`/api/v1/threads/${threadId}`)).status).toBe(403);
    expect((await stranger.post(`/api/v1/threads/${threadId}/messages`, { body: "Hello?" })).status).toBe(403);
    expect((await otherSawyer.get(`/api/v1/threads/${threadId}`)).status).toBe(403);
    expect((await otherSawyer.post(`/api/v1/threads/${threadId}/messages`, { body: "I have one too" })).status).toBe(403);
    expect(await threadsOf(stranger)).toEqual([]);
    expect((await request(ctx.app).get(`/api/v1/threads/${threadId}`)).status).toBe(401);

    await sawyer.post(`/api/v1/threads/${threadId}/messages`, { body: "One more thing: bring straps." });
    const read = await admin.get(`/api/v1/threads/${threadId}`);
    expect(read.status).toBe(200);
    expect(read.body.thread.myRole).toBe("observer");
    expect(read.body.messages).toHaveLength(4);
    expect(read.body.messages.at(-1).readAt).toBeNull();
    expect((await admin.post(`/api/v1/threads/${threadId}/messages`, { body: "Moderator here" })).status).toBe(403);
    expect((await threadsOf(asker))[0]!.unreadCount).toBe(1);
    expect((await admin.get(`/api/v1/threads/${crypto.randomUUID()}`)).status).toBe(404);
  });

  it("a sawyer cannot message their own listing; drafts and bad bodies are refused", async () => {
    const own = await sawyer.post(`/api/v1/listings/${walnut}/messages`, { body: "Talking to myself" });
    expect(own.status).toBe(403);
    expect(own.body.error.code).toBe("own_listing");
    expect((await admin.post(`/api/v1/listings/${walnut}/messages`, { body: "Admin question" })).status).toBe(403);
    const draft = await listing(sawyer, "Draft to ask about", "black-walnut", "draft");
    expect((await asker.post(`/api/v1/listings/${draft}/messages`, { body: "Hello" })).status).toBe(404);
    expect((await asker.post(`/api/v1/listings/${crypto.randomUUID()}/messages`, { body: "Hello" })).status).toBe(404);
    const empty = await asker.post(`/api/v1/listings/${walnut}/messages`, { body: "   " });
    expect(empty.status).toBe(422);
    expect(empty.body.error.fields).toHaveProperty("body");
    expect((await asker.post(`/api/v1/listings/${walnut}/messages`, { body: "x".repeat(4001) })).status).toBe(422);
    expect((await asker.post(`/api/v1/listings/${walnut}/messages`, { body: "x".repeat(4000) })).status).toBe(201);
    // Another yard's sawyer may ask, in a thread of their own.
    const colleague = await otherSawyer.post(`/api/v1/listings/${walnut}/messages`, { body: "Would you sell the offcuts?" });
    expect(colleague.status).toBe(201);
    expect(colleague.body.thread.id).not.toBe(threadId);
    expect((await threadsOf(sawyer)).map((t) => t.id)).toEqual([colleague.body.thread.id, threadId]);
  });
});

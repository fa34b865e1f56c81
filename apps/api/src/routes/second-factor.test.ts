import { RECOVERY_CODE_COUNT, RECOVERY_CODE_PATTERN } from "@grainyard/contracts";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { AccountEntity, AuditEntryEntity, RecoveryCodeEntity } from "../entities/index.ts";
import { codeAt } from "../services/second-factor-service.ts";
import { createTestContext, mailTo, type BrowserClient, type TestClock, type TestContext } from "../test-support/test-context.ts";

/**
 * The second factor on the real stack (MariaDB, SMTP sink): set-up, the sign-in's code step, replay,
 * drift, recovery codes, the code limit, an admin without one, removal. Time comes from a clock this
 * file holds still and moves by hand, so each code's 30-second step is known (no sleeping, no race
 * with a step boundary). Codes are made with otplib, the library the API checks them with.
 */
const STEP_MS = 30_000;
const CODE_LIMIT = 4;

/** A clock standing still in the middle of a 30-second step, moved only by the test. */
function stillClock(): TestClock & { at: (offsetMs: number) => Date } {
  let current = Math.floor(Date.now() / STEP_MS) * STEP_MS + STEP_MS / 2;
  return {
    now: () => new Date(current),
    advance: (ms) => void (current += ms),
    at: (offsetMs) => new Date(current + offsetMs),
  };
}

const clock = stillClock();
let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({ clock, environment: { SECOND_FACTOR_LIMIT_PER_ACCOUNT: String(CODE_LIMIT) } });
});
afterAll(async () => ctx?.close());

let lastHost = 20;
/** A client on its own loopback address, so one test's wrong codes never count against another's address. */
const freshClient = () => ctx.client({ from: `127.0.0.${++lastHost}` });
/** The code the account's app shows `steps` steps from now. */
const code = (secret: string, steps = 0) => codeAt(secret, clock.at(steps * STEP_MS));
const password = (client: BrowserClient, who: { email: string; password: string }) =>
  client.post("/api/v1/session", { email: who.email, password: who.password });
const secondStep = (client: BrowserClient, given: string) => client.post("/api/v1/session/second-factor", { code: given });
const audits = (accountId: string, action: string) =>
  ctx.dataSource.getRepository(AuditEntryEntity).countBy({ targetId: accountId, action });
const subjects = async (email: string) => (await mailTo(email)).map((m) => m.subject);

/** A sawyer who set up a second factor through the API: its secret and recovery codes. */
async function sawyerWithSecondFactor() {
  const client = await ctx.signedInClient("sawyer");
  const started = await client.post("/api/v1/account/second-factor/set-up");
  const secret = (started.body.secret as string).replace(/ /g, "");
  const confirmed = await client.post("/api/v1/account/second-factor", { code: await code(secret) });
  expect(confirmed.status).toBe(201);
  // Each test signs in a minute after the set-up, so even the step before "now" is later than the set-up's code.
  clock.advance(2 * STEP_MS);
  return { client, account: client.account, secret, recoveryCodes: confirmed.body.recoveryCodes as string[] };
}

describe("setting up a second factor", () => {
  it("shows a QR code and the secret, stays off until a first code confirms it, then gives ten recovery codes once, stored hashed; audited and e-mailed", async () => {
    const client = await ctx.signedInClient("sawyer");
    expect((await client.get("/api/v1/account/second-factor")).body).toEqual({
      on: false,
      since: null,
      required: false,
      recoveryCodesLeft: 0,
    });

    const started = await client.post("/api/v1/account/second-factor/set-up");
    expect(started.status).toBe(200);
    expect(started.body.secret).toMatch(/^[A-Z2-7]{4}( [A-Z2-7]{1,4})+$/);
    const secret = (started.body.secret as string).replace(/ /g, "");
    expect(started.body.otpauthUrl).toBe(
      `otpauth://totp/Grainyard:${encodeURIComponent(client.account.email)}?secret=${secret}&issuer=Grainyard`,
    );
    expect(started.body.qrCode).toMatch(/^data:image\/svg\+xml;base64,/);
    expect(Buffer.from(started.body.qrCode.split(",")[1], "base64").toString()).toContain("<svg");

    // A wrong first code switches nothing on.
    const wrong = await client.post("/api/v1/account/second-factor", {
      code: (Number(await code(secret)) + 1).toString().padStart(6, "0").slice(-6),
    });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.code).toBe("second_factor_wrong");
    expect((await client.get("/api/v1/account/second-factor")).body.on).toBe(false);
    // Signing in still takes the password alone.
    expect((await password(await freshClient(), client.account)).body.account?.email).toBe(client.account.email);

    const confirmed = await client.post("/api/v1/account/second-factor", { code: await code(secret) });
    expect(confirmed.status).toBe(201);
    const recoveryCodes = confirmed.body.recoveryCodes as string[];
    expect(recoveryCodes).toHaveLength(RECOVERY_CODE_COUNT);
    expect(new Set(recoveryCodes).size).toBe(RECOVERY_CODE_COUNT);
    for (const recovery of recoveryCodes) expect(recovery).toMatch(RECOVERY_CODE_PATTERN);
    expect(confirmed.body.status).toMatchObject({ on: true, required: false, recoveryCodesLeft: RECOVERY_CODE_COUNT });

    // Only bcrypt hashes are kept; the secret moved from pending to live.
    const stored = await ctx.dataSource.getRepository(RecoveryCodeEntity).findBy({ accountId: client.account.id });
    expect(stored).toHaveLength(RECOVERY_CODE_COUNT);
    for (const row of stored) {
      expect(row.codeHash).toMatch(/^\$2[aby]\$/);
      for (const recovery of recoveryCodes) expect(row.codeHash).not.toContain(recovery.replace("-", ""));
    }
    const account = await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ id: client.account.id });
    expect(account).toMatchObject({ totpSecret: secret, totpPendingSecret: null });

    // Confirming again, or starting again, is refused while it is on.
    expect((await client.post("/api/v1/account/second-factor/set-up")).body.error.code).toBe("second_factor_on");
    expect(await audits(client.account.id, "second_factor.on")).toBe(1);
    expect(await subjects(client.account.email)).toContain("A second factor is now on for your Grainyard account");
  });

  it("refuses a confirmation before any set-up was started", async () => {
    const client = await ctx.signedInClient("sawyer");
    const res = await client.post("/api/v1/account/second-factor", { code: "123456" });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("second_factor_not_started");
  });
});

describe("signing in with a second factor", () => {
  it("asks for the code after the password, opens no session until it is right, then signs in", async () => {
    const { account, secret } = await sawyerWithSecondFactor();
    const client = await freshClient();
    const first = await password(client, account);
    expect(first.status).toBe(200);
    expect(first.body.account).toBeNull();
    expect(first.body.secondStep).toEqual({ email: account.email, until: expect.any(String) });
    // Nobody is signed in between the two steps.
    expect((await client.get("/api/v1/yard")).status).toBe(401);
    expect((await client.get("/api/v1/session")).body).toMatchObject({ account: null, secondStep: { email: account.email } });

    const wrong = await secondStep(client, "000000");
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.code).toBe("second_factor_wrong");
    expect((await client.get("/api/v1/yard")).status).toBe(401);

    const right = await secondStep(client, await code(secret));
    expect(right.status).toBe(200);
    expect(right.body).toMatchObject({ account: { email: account.email }, secondStep: null });
    expect((await client.get("/api/v1/yard")).status).toBe(200);
  });

  it("never takes a code twice, nor a code of an earlier step after a later one", async () => {
    const { account, secret } = await sawyerWithSecondFactor();
    const now = await code(secret);
    const first = await freshClient();
    await password(first, account);
    expect((await secondStep(first, now)).status).toBe(200);

    // Someone who saw that code, from elsewhere, within the same 30 seconds.
    const second = await freshClient();
    await password(second, account);
    const replayed = await secondStep(second, now);
    expect(replayed.status).toBe(409);
    expect(replayed.body.error.code).toBe("second_factor_used");
    // The step before is still inside the drift window, but earlier than the one used: refused too.
    expect((await secondStep(second, await code(secret, -1))).body.error.code).toBe("second_factor_used");
    expect((await second.get("/api/v1/yard")).status).toBe(401);

    // The next step's code works (the app shows a new one every 30 seconds).
    clock.advance(STEP_MS);
    expect((await secondStep(second, await code(secret))).status).toBe(200);
  });

  it("takes a code one step behind or ahead (a phone's clock drifts), never two", async () => {
    const { account, secret } = await sawyerWithSecondFactor();
    const client = await freshClient();
    await password(client, account);
    expect((await secondStep(client, await code(secret, -2))).body.error.code).toBe("second_factor_wrong");
    expect((await secondStep(client, await code(secret, 2))).body.error.code).toBe("second_factor_wrong");
    expect((await secondStep(client, await code(secret, -1))).status).toBe(200);

    const later = await freshClient();
    await password(later, account);
    expect((await secondStep(later, await code(secret, 1))).status).toBe(200);
  });

  it("takes a recovery code instead, once: e-mailed and audited; the same code again is refused", async () => {
    const { account, recoveryCodes, client: owner } = await sawyerWithSecondFactor();
    const client = await freshClient();
    await password(client, account);
    // Typed in capitals with a space instead of the dash still works.
    const signedIn = await secondStep(client, recoveryCodes[3]!.toUpperCase().replace("-", " "));
    expect(signedIn.status).toBe(200);
    expect(signedIn.body.account.email).toBe(account.email);
    expect((await owner.get("/api/v1/account/second-factor")).body.recoveryCodesLeft).toBe(RECOVERY_CODE_COUNT - 1);
    expect(await audits(account.id, "second_factor.recovery_code_used")).toBe(1);
    expect(await subjects(account.email)).toContain("A recovery code was used to sign in to Grainyard");

    const again = await freshClient();
    await password(again, account);
    const reused = await secondStep(again, recoveryCodes[3]!);
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe("second_factor_wrong");
    expect((await again.get("/api/v1/yard")).status).toBe(401);
    // Another unused one still works.
    expect((await secondStep(again, recoveryCodes[4]!)).status).toBe(200);
  });

  it("forgets the password step after a few minutes", async () => {
    const { account, secret } = await sawyerWithSecondFactor();
    const client = await freshClient();
    await password(client, account);
    clock.advance(6 * 60_000);
    const late = await secondStep(client, await code(secret));
    expect(late.status).toBe(401);
    expect(late.body.error.code).toBe("second_step_expired");
    // Without a password step at all, the same.
    expect((await secondStep(await freshClient(), await code(secret))).body.error.code).toBe("second_step_expired");
  });

  it(`limits wrong codes per account: after ${CODE_LIMIT} the account's codes get 429 from every address, even a right one`, async () => {
    const { account, secret } = await sawyerWithSecondFactor();
    const attacker = await freshClient();
    await password(attacker, account);
    for (let i = 0; i < CODE_LIMIT; i++) expect((await secondStep(attacker, `00000${i}`)).status).toBe(422);
    const refused = await secondStep(attacker, "111111");
    expect(refused.status).toBe(429);
    expect(refused.body.error.message).toMatch(/too many wrong codes for this account/i);
    expect(Number(refused.headers["retry-after"])).toBeGreaterThan(0);
    expect((await secondStep(attacker, await code(secret))).status).toBe(429);

    // The count lives in MariaDB (shared by every API instance) and holds for the account from another address too.
    const rows = (await ctx.dataSource.query("SELECT `key` FROM rate_limit WHERE `key` = ?", [`code_account:${account.id}`])) as unknown[];
    expect(rows).toHaveLength(1);
    const elsewhere = await freshClient();
    await password(elsewhere, account);
    expect((await secondStep(elsewhere, await code(secret))).status).toBe(429);
    expect((await elsewhere.get("/api/v1/yard")).status).toBe(401);
  });
});

describe("an admin without a second factor", () => {
  it("signs in with the password but reaches only the set-up until one is on; then the desk opens in the same session", async () => {
    const admin = await ctx.createAccount("admin", { secondFactor: false });
    const client = await freshClient();
    const signedIn = await password(client, admin);
    expect(signedIn.status).toBe(200);
    expect(signedIn.body).toMatchObject({ account: { role: "admin" }, secondFactorSetUpNeeded: true });
    expect((await client.get("/api/v1/session")).body.secondFactorSetUpNeeded).toBe(true);

    for (const path of ["/api/v1/admin/users", "/api/v1/admin/audit", "/api/v1/admin/reports"]) {
      const refused = await client.get(path);
      expect(refused.status, path).toBe(403);
      expect(refused.body.error.code, path).toBe("second_factor_setup_required");
    }
    expect((await client.get("/api/v1/account/second-factor")).body).toMatchObject({ on: false, required: true });

    const started = await client.post("/api/v1/account/second-factor/set-up");
    const secret = (started.body.secret as string).replace(/ /g, "");
    expect((await client.post("/api/v1/account/second-factor", { code: await code(secret) })).status).toBe(201);
    expect((await client.get("/api/v1/session")).body.secondFactorSetUpNeeded).toBe(false);
    expect((await client.get("/api/v1/admin/users")).status).toBe(200);
    // Its own set-up is in the audit log.
    expect(await audits(admin.id, "second_factor.on")).toBe(1);
  });

  it("is restricted again after removing it, and signs in with the password and a code while it is on", async () => {
    const admin = await ctx.createAccount("admin");
    const client = await freshClient();
    expect((await password(client, admin)).body.secondStep).toMatchObject({ email: admin.email });
    expect((await secondStep(client, await code(admin.totpSecret!))).status).toBe(200);
    expect((await client.get("/api/v1/admin/users")).status).toBe(200);

    clock.advance(STEP_MS);
    const removed = await client.post("/api/v1/account/second-factor/removal", {
      password: admin.password,
      code: await code(admin.totpSecret!),
    });
    expect(removed.status).toBe(200);
    expect(removed.body).toMatchObject({ on: false, required: true });
    expect((await client.get("/api/v1/admin/users")).body.error.code).toBe("second_factor_setup_required");
    expect(await subjects(admin.email)).toContain("The second factor was removed from your Grainyard account");
  });
});

describe("removing a second factor", () => {
  it("needs the password and a current code; audited and e-mailed; then sign-in is the password alone and old recovery codes are gone", async () => {
    const { client, account, secret } = await sawyerWithSecondFactor();
    const wrongPassword = await client.post("/api/v1/account/second-factor/removal", {
      password: "not-my-password",
      code: await code(secret),
    });
    expect(wrongPassword.status).toBe(422);
    expect(wrongPassword.body.error).toMatchObject({ code: "wrong_password", fields: { password: expect.any(String) } });
    const wrongCode = await client.post("/api/v1/account/second-factor/removal", { password: account.password, code: "000000" });
    expect(wrongCode.body.error.code).toBe("second_factor_wrong");
    expect((await client.get("/api/v1/account/second-factor")).body.on).toBe(true);
    expect(await audits(account.id, "second_factor.off")).toBe(0);

    const removed = await client.post("/api/v1/account/second-factor/removal", { password: account.password, code: await code(secret) });
    expect(removed.status).toBe(200);
    expect(removed.body).toEqual({ on: false, since: null, required: false, recoveryCodesLeft: 0 });
    expect(await ctx.dataSource.getRepository(RecoveryCodeEntity).countBy({ accountId: account.id })).toBe(0);
    expect(await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ id: account.id })).toMatchObject({
      totpSecret: null,
      totpOnAt: null,
      totpLastStep: null,
    });
    expect(await audits(account.id, "second_factor.off")).toBe(1);
    expect(await subjects(account.email)).toContain("The second factor was removed from your Grainyard account");

    const later = await password(await freshClient(), account);
    expect(later.body).toMatchObject({ account: { email: account.email }, secondStep: null });
    // Nothing left to remove.
    expect(
      (await client.post("/api/v1/account/second-factor/removal", { password: account.password, code: "123456" })).body.error.code,
    ).toBe("second_factor_off");
  });
});

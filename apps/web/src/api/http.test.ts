import { afterEach, describe, expect, it, vi } from "vitest";
import { CSRF_HEADER, accountEndpoints, adminEndpoints, pathOf } from "@grainyard/contracts";
import { accountsApi } from "./accounts.ts";
import { adminApi } from "./admin.ts";
import { ApiRequestError, OFFLINE_MESSAGE, errorDetail, hasErrorCode } from "./errors.ts";
import { transport, urlOf } from "./http.ts";

const account = {
  id: "acc_1",
  email: "wren@cobblelane.example",
  displayName: "Wren Halloway",
  role: "sawyer",
  emailVerified: false,
  yardName: "Cobble Lane Slabworks",
  yardSlug: "cobble-lane-slabworks",
  yardStory: null,
  pickupTown: "Lakemont",
  createdAt: "2025-03-02T10:00:00.000Z",
};

function json(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json" } });
}

afterEach(() => {
  transport.useFetch(undefined);
  transport.useCsrfToken(() => null);
});

function setup(responder: () => Response | Promise<Response>, token: string | null = "tok-123") {
  const fetchMock = vi.fn(async (_url: string | URL | Request, _init?: RequestInit) => responder());
  transport.useFetch(fetchMock as unknown as typeof fetch);
  transport.useCsrfToken(() => token);
  const client = { ...accountsApi, ...adminApi };
  const call = (index = 0) => {
    const [url, init] = fetchMock.mock.calls[index] ?? [];
    return { url: String(url), init: init ?? {}, headers: (init?.headers ?? {}) as Record<string, string> };
  };
  return { client, fetchMock, call };
}

async function caught(promise: Promise<unknown>): Promise<ApiRequestError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiRequestError) return error;
    throw error;
  }
  throw new Error("expected the request to fail");
}

describe("api transport: requests", () => {
  it("adds the CSRF token, a JSON body and same-origin credentials to a POST", async () => {
    const { client, call } = setup(() => json(200, { account, csrfToken: "fresh" }));
    const state = await client.signIn({ body: { email: account.email, password: "correct horse battery" } });

    const { url, init, headers } = call();
    expect(url).toBe(accountEndpoints.signIn.path);
    expect(init.method).toBe("POST");
    expect(init.credentials).toBe("same-origin");
    expect(headers[CSRF_HEADER]).toBe("tok-123");
    expect(headers["content-type"]).toBe("application/json");
    expect(JSON.parse(String(init.body))).toEqual({ email: account.email, password: "correct horse battery" });
    expect(state.csrfToken).toBe("fresh");
    expect(state.account?.yardName).toBe("Cobble Lane Slabworks");
  });

  it("adds the CSRF token to DELETE and PATCH as well", async () => {
    const { client, call } = setup(() => json(200, { account, csrfToken: "x" }));
    await client.signOut().catch(() => undefined);
    await client.updateYard({ sawyerId: "acc_1", body: { pickupTown: "Northshore" } });
    expect(call(0).init.method).toBe("DELETE");
    expect(call(0).headers[CSRF_HEADER]).toBe("tok-123");
    expect(call(1).url).toBe(pathOf(accountEndpoints.updateYard, { sawyerId: "acc_1" }));
    expect(call(1).init.method).toBe("PATCH");
    expect(call(1).headers[CSRF_HEADER]).toBe("tok-123");
  });

  it("does not send the CSRF token on a GET", async () => {
    const { client, call } = setup(() => json(200, { account: null, csrfToken: "t" }));
    await client.getSession();
    expect(call().init.method).toBe("GET");
    expect(call().headers[CSRF_HEADER]).toBeUndefined();
    expect(call().init.body).toBeUndefined();
  });

  it("uses the newest token the provider gives", async () => {
    let token = "first";
    const fetchMock = vi.fn(async () => json(202, { sent: true }));
    transport.useFetch(fetchMock as unknown as typeof fetch);
    transport.useCsrfToken(() => token);
    await accountsApi.resendVerification();
    token = "second";
    await accountsApi.resendVerification();
    const headers = fetchMock.mock.calls.map((args) => ((args as unknown[])[1] as RequestInit).headers as Record<string, string>);
    expect(headers.map((h) => h[CSRF_HEADER])).toEqual(["first", "second"]);
  });

  it("builds the query and leaves out empty filters", async () => {
    const { client, call } = setup(() => json(200, { users: [] }));
    await client.searchUsers({ query: { query: "cobble", role: "sawyer", suspended: undefined } });
    expect(call(0).url).toBe(`${adminEndpoints.searchUsers.path}?query=cobble&role=sawyer`);
    await client.searchUsers({ query: { query: "" } });
    expect(call(1).url).toBe(adminEndpoints.searchUsers.path);
  });

  it("fills in and encodes path parameters, and gives file rows as addresses", () => {
    expect(urlOf(accountEndpoints.updateYard, { sawyerId: "a b/c" })).toBe("/api/v1/yards/a%20b%2Fc");
    expect(adminApi.exportAuditCsv({ query: { action: "listing.approved", cursor: "" } })).toBe(
      "/api/v1/admin/audit.csv?action=listing.approved",
    );
  });
});

describe("api transport: errors", () => {
  it("parses a 422 answer into status, code, message and field messages", async () => {
    const { client } = setup(() =>
      json(422, {
        error: {
          code: "invalid_input",
          message: "Check the highlighted fields.",
          fields: { password: "That password is too common. Pick something less guessable." },
        },
      }),
    );
    const error = await caught(
      client.signUp({ body: { role: "buyer", email: "a@b.example", password: "password123", displayName: "Ada" } }),
    );
    expect(error.status).toBe(422);
    expect(error.code).toBe("invalid_input");
    expect(error.message).toBe("Check the highlighted fields.");
    expect(error.fields).toEqual({ password: "That password is too common. Pick something less guessable." });
    expect(error.isOffline).toBe(false);
  });

  it("keeps the API's message for 401 and 429", async () => {
    const answers = [
      json(401, { error: { code: "not_signed_in", message: "That e-mail and password do not match." } }),
      json(429, { error: { code: "too_many_requests", message: "Too many tries. Wait 10 minutes." } }),
    ];
    const { client } = setup(() => answers.shift()!);
    const wrong = await caught(client.signIn({ body: { email: "a@b.example", password: "nope" } }));
    expect([wrong.status, wrong.code, wrong.message]).toEqual([401, "not_signed_in", "That e-mail and password do not match."]);
    expect(wrong.fields).toEqual({});
    const slow = await caught(client.signIn({ body: { email: "a@b.example", password: "nope" } }));
    expect([slow.status, slow.code, slow.message]).toEqual([429, "too_many_requests", "Too many tries. Wait 10 minutes."]);
  });

  it("turns a network failure into a clear offline error", async () => {
    const { client } = setup(() => {
      throw new TypeError("Failed to fetch");
    });
    const error = await caught(client.getSession());
    expect(error.status).toBe(0);
    expect(error.code).toBe("offline");
    expect(error.isOffline).toBe(true);
    expect(error.message).toBe(OFFLINE_MESSAGE);
    expect(error.message).toMatch(/offline/);
  });

  it("treats a gateway answer without a JSON error as 'unavailable'", async () => {
    const { client } = setup(() => new Response("<html>Bad gateway</html>", { status: 502 }));
    const error = await caught(client.getSession());
    expect(error.status).toBe(502);
    expect(error.code).toBe("unavailable");
  });

  it("rejects a success answer that does not match the contract", async () => {
    const { client } = setup(() => json(200, { account: { id: 42 }, csrfToken: "t" }));
    const error = await caught(client.getSession());
    expect(error.code).toBe("unexpected_response");
  });

  it("accepts a 204 answer with no body where the row has no answer", async () => {
    const { call } = setup(() => new Response(null, { status: 204 }));
    const { buyerApi } = await import("./buyer.ts");
    await expect(buyerApi.removeFavourite({ listingId: "lst_1" })).resolves.toBeUndefined();
    expect(call().init.method).toBe("DELETE");
    expect(call().init.body).toBeUndefined();
  });

  it("narrows on catalogue codes and reads the detail a code carries", async () => {
    const rows = [{ row: 2, field: "thicknessMm", message: "Too thin." }];
    const { client } = setup(() => json(422, { error: { code: "csv_rows_invalid", message: "1 row needs fixing.", rows } }));
    const error = await caught(client.signIn({ body: { email: "a@b.example", password: "x" } }));
    expect(hasErrorCode(error, "csv_rows_invalid")).toBe(true);
    expect(hasErrorCode(error, "bad_cursor")).toBe(false);
    expect(errorDetail(error, "csv_rows_invalid")).toEqual({ rows });
    const other = new ApiRequestError(422, "csv_rows_invalid", "x", {}, { code: "csv_rows_invalid", message: "x", rows: "not rows" });
    expect(errorDetail(other, "csv_rows_invalid")).toBeNull();
  });
});

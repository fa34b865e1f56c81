import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { accountEndpoints } from "@grainyard/contracts";
import SignInView from "./SignInView.vue";
import { mountView, noteFor, typeInto } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";

const sawyer = {
  id: "acc_2",
  email: "moss@ridgeback.example",
  displayName: "Moss Ferrand",
  role: "sawyer",
  emailVerified: true,
  yardName: "Ridgeback Urban Timber",
  yardSlug: "ridgeback-urban-timber",
  yardStory: null,
  pickupTown: "Lakemont",
  createdAt: "2025-01-10T09:00:00.000Z",
};

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

async function fillAndSubmit(wrapper: Awaited<ReturnType<typeof mountView>>["wrapper"]) {
  await typeInto(wrapper, "email", "moss@ridgeback.example");
  await typeInto(wrapper, "password", "a long enough phrase");
  await wrapper.find("form").trigger("submit");
  await flushPromises();
}

describe("SignInView", () => {
  it("validates in the browser first", async () => {
    const { wrapper } = await mountView(SignInView, { path: "/sign-in" });
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(noteFor(wrapper, "email")).toBe("Enter a valid e-mail address, like name@example.org.");
    expect(noteFor(wrapper, "password")).toBe("Enter your password.");
  });

  it("sends a sawyer to the yard and keeps the fresh CSRF token", async () => {
    const { wrapper, router, session } = await mountView(SignInView, {
      path: "/sign-in",
      answers: { [`POST ${accountEndpoints.getSession.path}`]: [{ status: 200, body: { account: sawyer, csrfToken: "after-sign-in" } }] },
    });
    await fillAndSubmit(wrapper);
    await vi.waitFor(() => expect(router.currentRoute.value.path).toBe("/yard"), { timeout: 10_000 });
    expect(session.csrfToken).toBe("after-sign-in");
    expect(session.isSawyer).toBe(true);
  });

  it("follows ?next= inside the app, but never to another site", async () => {
    const first = await mountView(SignInView, {
      path: "/sign-in?next=/yard%3Ftab%3Dlogs",
      answers: { [`POST ${accountEndpoints.getSession.path}`]: [{ status: 200, body: { account: sawyer, csrfToken: "t" } }] },
    });
    await fillAndSubmit(first.wrapper);
    await vi.waitFor(() => expect(first.router.currentRoute.value.fullPath).toBe("/yard?tab=logs"), { timeout: 10_000 });
    first.wrapper.unmount();

    const second = await mountView(SignInView, {
      path: "/sign-in?next=//elsewhere.example/phish",
      answers: { [`POST ${accountEndpoints.getSession.path}`]: [{ status: 200, body: { account: sawyer, csrfToken: "t" } }] },
    });
    await fillAndSubmit(second.wrapper);
    await vi.waitFor(() => expect(second.router.currentRoute.value.fullPath).toBe("/yard"), { timeout: 10_000 });
  });

  it("sends an account with a second factor on to the code step, keeping ?next=", async () => {
    const { wrapper, router, session } = await mountView(SignInView, {
      path: "/sign-in?next=/yard/payouts",
      answers: {
        [`POST ${accountEndpoints.getSession.path}`]: [
          {
            status: 200,
            body: { account: null, csrfToken: "t", secondStep: { email: sawyer.email, until: "2026-12-03T12:05:00.000Z" } },
          },
        ],
      },
    });
    await fillAndSubmit(wrapper);
    await vi.waitFor(() => expect(router.currentRoute.value.fullPath).toBe("/sign-in/code?next=/yard/payouts"), { timeout: 10_000 });
    expect(session.account).toBeNull();
    expect(session.secondStep?.email).toBe(sawyer.email);
  });

  it("shows the API's message for wrong credentials and for too many tries", async () => {
    const { wrapper } = await mountView(SignInView, {
      path: "/sign-in",
      answers: {
        [`POST ${accountEndpoints.getSession.path}`]: [
          { status: 401, body: { error: { code: "not_signed_in", message: "That e-mail and password don't match." } } },
          { status: 429, body: { error: { code: "too_many_requests", message: "Too many tries. Wait a few minutes." } } },
        ],
      },
    });
    await fillAndSubmit(wrapper);
    expect(wrapper.find('[role="alert"]').text()).toContain("That e-mail and password don't match.");
    await fillAndSubmit(wrapper);
    expect(wrapper.find('[role="alert"]').text()).toContain("Too many tries. Wait a few minutes.");
  });

  it("tells a suspended person plainly why they cannot sign in", async () => {
    const { wrapper, router } = await mountView(SignInView, {
      path: "/sign-in",
      answers: {
        [`POST ${accountEndpoints.getSession.path}`]: [
          { status: 403, body: { error: { code: "account_suspended", message: "This account is suspended, so it cannot sign in." } } },
        ],
      },
    });
    await fillAndSubmit(wrapper);
    const alert = wrapper.find('[role="alert"]').text();
    expect(alert).toContain("This account is suspended");
    expect(alert).toContain("so it cannot sign in.");
    expect(router.currentRoute.value.fullPath).toBe("/sign-in");
  });
});

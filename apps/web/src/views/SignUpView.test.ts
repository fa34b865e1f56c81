import { afterEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { accountEndpoints, CSRF_HEADER } from "@grainyard/contracts";
import SignUpView from "./SignUpView.vue";
import { mountView, noteFor, typeInto } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

async function submit(wrapper: Awaited<ReturnType<typeof mountView>>["wrapper"]) {
  await wrapper.find("form").trigger("submit");
  await flushPromises();
}

describe("SignUpView", () => {
  it("labels every field with the agreed texts", async () => {
    const { wrapper } = await mountView(SignUpView, { path: "/join?role=sawyer" });
    const labels = wrapper.findAll("label[for]").map((label) => [label.attributes("for"), label.text()]);
    expect(labels).toEqual(
      expect.arrayContaining([
        ["displayName", "Your name"],
        ["email", "E-mail"],
        ["password", "Password"],
        ["yardName", "Yard name"],
        ["pickupTown", "Pickup town"],
      ]),
    );
  });

  it("shows the shared schema's messages beside each field and sends nothing", async () => {
    const { wrapper, fetchMock } = await mountView(SignUpView, { path: "/join" });
    const before = fetchMock.mock.calls.length;
    await typeInto(wrapper, "email", "not-an-address");
    await typeInto(wrapper, "password", "short");
    await submit(wrapper);

    expect(wrapper.find("#role-note").text()).toBe("Choose whether you buy slabs or sell them.");
    expect(noteFor(wrapper, "displayName")).toBe("Tell us your name.");
    expect(noteFor(wrapper, "email")).toBe("Enter a valid e-mail address, like name@example.org.");
    expect(noteFor(wrapper, "password")).toBe("Use at least 10 characters.");
    expect(wrapper.find("#password").attributes("aria-invalid")).toBe("true");
    expect(fetchMock.mock.calls.length).toBe(before);
  });

  it("shows the password rule before anything goes wrong", async () => {
    const { wrapper } = await mountView(SignUpView, { path: "/join" });
    expect(noteFor(wrapper, "password")).toMatch(/At least 10 characters, and not a common password/);
  });

  it("asks sawyers for a yard name and pickup town", async () => {
    const { wrapper } = await mountView(SignUpView, { path: "/join" });
    expect(wrapper.find("#yardName").exists()).toBe(false);
    await wrapper.find('[data-test="role-sawyer"] input').setValue(true);
    await typeInto(wrapper, "displayName", "Wren Halloway");
    await typeInto(wrapper, "email", "wren@cobblelane.example");
    await typeInto(wrapper, "password", "sticker stacks dry slowly");
    await typeInto(wrapper, "pickupTown", "L");
    await submit(wrapper);
    expect(noteFor(wrapper, "yardName")).toBe("Give your yard a name of at least 2 characters.");
    expect(noteFor(wrapper, "pickupTown")).toBe("Say which town buyers collect from.");
  });

  it("puts the API's 422 field messages beside the fields", async () => {
    const { wrapper } = await mountView(SignUpView, {
      path: "/join?role=buyer",
      answers: {
        [`POST ${accountEndpoints.signUp.path}`]: [
          {
            status: 422,
            body: {
              error: {
                code: "invalid_input",
                message: "Check the highlighted fields.",
                fields: { password: "That password is too common. Choose one that is harder to guess." },
              },
            },
          },
        ],
      },
    });
    await typeInto(wrapper, "displayName", "Ada Marsh");
    await typeInto(wrapper, "email", "ada@example.org");
    await typeInto(wrapper, "password", "password1234");
    await submit(wrapper);
    expect(noteFor(wrapper, "password")).toBe("That password is too common. Choose one that is harder to guess.");
    expect(wrapper.find('[role="alert"]').text()).toContain("Check the highlighted fields.");
  });

  it("shows a 409 (signed in already) beside the e-mail field", async () => {
    const { wrapper } = await mountView(SignUpView, {
      path: "/join?role=buyer",
      answers: {
        [`POST ${accountEndpoints.signUp.path}`]: [
          {
            status: 409,
            body: { error: { code: "already_signed_in", message: "You are already signed in. Sign out to create another account." } },
          },
        ],
      },
    });
    await typeInto(wrapper, "displayName", "Ada Marsh");
    await typeInto(wrapper, "email", "ada@example.org");
    await typeInto(wrapper, "password", "a long enough phrase");
    await submit(wrapper);
    expect(noteFor(wrapper, "email")).toBe("You are already signed in. Sign out to create another account.");
  });

  it("sends the sawyer's sign-up with the CSRF token and shows 'check your inbox'", async () => {
    const { wrapper, fetchMock } = await mountView(SignUpView, {
      path: "/join?role=sawyer",
      answers: {
        [`POST ${accountEndpoints.signUp.path}`]: [
          { status: 202, body: { message: "Check your inbox: we sent a link to confirm your address." } },
        ],
      },
    });
    await typeInto(wrapper, "displayName", "Wren Halloway");
    await typeInto(wrapper, "email", "  Wren@CobbleLane.example ");
    await typeInto(wrapper, "password", "sticker stacks dry slowly");
    await typeInto(wrapper, "yardName", "Cobble Lane Slabworks");
    await typeInto(wrapper, "pickupTown", "Lakemont");
    await submit(wrapper);

    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST");
    expect(post).toBeDefined();
    const init = post![1]!;
    expect((init.headers as Record<string, string>)[CSRF_HEADER]).toBe("test-token");
    expect(JSON.parse(String(init.body))).toEqual({
      role: "sawyer",
      displayName: "Wren Halloway",
      email: "wren@cobblelane.example",
      password: "sticker stacks dry slowly",
      yardName: "Cobble Lane Slabworks",
      pickupTown: "Lakemont",
    });
    const inbox = wrapper.find('[data-test="check-inbox"]');
    expect(inbox.exists()).toBe(true);
    expect(inbox.text()).toContain("wren@cobblelane.example");
  });
});

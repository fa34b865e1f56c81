import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { pathOf, messageEndpoints, type Message } from "@grainyard/contracts";
import { transport } from "../api/http.ts";
import { mountView, type StubbedAnswer } from "../test/mount-view.ts";
import { sawyerAccount, threadSummary } from "../test/fixtures.ts";
import { THREAD_POLL_MS } from "../utils/messages.ts";
import ThreadView from "./ThreadView.vue";

afterEach(() => {
  vi.useRealTimers();
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const asSawyer = threadSummary({ myRole: "sawyer", otherParty: { id: "acc_buyer", displayName: "Ana and Theo Brandt" }, unreadCount: 0 });
const question: Message = {
  id: "1",
  threadId: "thr_1",
  authorId: "acc_buyer",
  authorName: "Ana and Theo Brandt",
  fromMe: false,
  body: "Is it flat enough for a dining top?\nWe have eight chairs.",
  createdAt: "2026-12-02T09:00:00.000Z",
  readAt: "2026-12-02T09:05:00.000Z",
};
const answer: Message = {
  ...question,
  id: "2",
  authorId: "acc_sawyer",
  authorName: "Oskar Lindqvist",
  fromMe: true,
  body: "Yes: flattened both faces.",
  readAt: null,
};
const detail = (messages: Message[]): StubbedAnswer => ({ status: 200, body: { thread: asSawyer, messages } });
const GET = `GET ${pathOf(messageEndpoints.getThread, { threadId: "thr_1" })}`;
const POST = `POST ${pathOf(messageEndpoints.replyInThread, { threadId: "thr_1" })}`;

describe("a conversation", () => {
  it("shows the messages with the other person and the listing, and sends a reply", async () => {
    const { wrapper, fetchMock } = await mountView(ThreadView, {
      path: "/messages/thr_1",
      session: { account: sawyerAccount },
      answers: { [GET]: [detail([question])], [POST]: [{ status: 201, body: { thread: asSawyer, message: answer } }] },
    });
    expect(wrapper.find('[data-test="thread-with"]').text()).toBe("Ana and Theo Brandt");
    expect(wrapper.find('[data-test="thread-listing"]').attributes("href")).toBe("/slabs/lst_oak");
    expect(wrapper.findAll('[data-test="message"]').map((m) => m.find(".thread__body").text())).toEqual([question.body]);

    const send = wrapper.find<HTMLButtonElement>('[data-test="send"]');
    expect(send.element.disabled).toBe(true);
    await wrapper.find('[data-test="reply-box"]').setValue("  Yes: flattened both faces.  ");
    await wrapper.find('[data-test="send-form"]').trigger("submit");
    // While it is on its way: the button says so and the box waits.
    expect(wrapper.find('[data-test="send"]').text()).toBe("Sending…");
    expect((wrapper.find('[data-test="reply-box"]').element as HTMLTextAreaElement).disabled).toBe(true);
    await flushPromises();

    const posted = fetchMock.mock.calls.find(
      ([url, init]) =>
        String(url) === pathOf(messageEndpoints.replyInThread, { threadId: "thr_1" }) && (init as RequestInit).method === "POST",
    );
    expect(JSON.parse(String((posted![1] as RequestInit).body))).toEqual({ body: "Yes: flattened both faces." });
    const bubbles = wrapper.findAll('[data-test="message"]');
    expect(bubbles).toHaveLength(2);
    expect(bubbles[1]!.attributes("data-from-me")).toBe("true");
    expect((wrapper.find('[data-test="reply-box"]').element as HTMLTextAreaElement).value).toBe("");
  });

  it("keeps the text and says why when sending fails", async () => {
    const { wrapper } = await mountView(ThreadView, {
      path: "/messages/thr_1",
      session: { account: sawyerAccount },
      answers: {
        [GET]: [detail([question])],
        [POST]: [
          {
            status: 422,
            body: {
              error: { code: "invalid", message: "Check the message.", fields: { body: "Keep the message under 4000 characters." } },
            },
          },
        ],
      },
    });
    await wrapper.find('[data-test="reply-box"]').setValue("A long answer");
    await wrapper.find('[data-test="send-form"]').trigger("submit");
    await flushPromises();
    expect(wrapper.find('[data-test="send-error"]').text()).toBe("Keep the message under 4000 characters.");
    expect((wrapper.find('[data-test="reply-box"]').element as HTMLTextAreaElement).value).toBe("A long answer");
    expect(wrapper.findAll('[data-test="message"]')).toHaveLength(1);
    expect(wrapper.find('[data-test="send"]').text()).toBe("Send");
  });

  it("picks up new messages by polling while open", async () => {
    vi.useFakeTimers({ toFake: ["setTimeout", "clearTimeout"] });
    const reply = { ...answer, id: "3", fromMe: false, authorName: "Ana and Theo Brandt", body: "Could we see it on Saturday?" };
    const { wrapper } = await mountView(ThreadView, {
      path: "/messages/thr_1",
      session: { account: sawyerAccount },
      answers: { [GET]: [detail([question]), detail([question, reply])] },
    });
    expect(wrapper.findAll('[data-test="message"]')).toHaveLength(1);
    await vi.advanceTimersByTimeAsync(THREAD_POLL_MS + 10);
    await flushPromises();
    expect(wrapper.findAll('[data-test="message"]').map((m) => m.find(".thread__body").text())).toEqual([
      question.body,
      "Could we see it on Saturday?",
    ]);
    wrapper.unmount();
  });

  it("says so when the conversation is someone else's", async () => {
    const { wrapper } = await mountView(ThreadView, {
      path: "/messages/thr_1",
      session: { account: sawyerAccount },
      answers: { [GET]: [{ status: 403, body: { error: { code: "forbidden", message: "That conversation is between other people." } } }] },
    });
    expect(wrapper.find('[data-test="thread-not-found"]').exists()).toBe(true);
    expect(wrapper.find('[data-test="send-form"]').exists()).toBe(false);
  });

  it("lets an admin read without a send box", async () => {
    const { wrapper } = await mountView(ThreadView, {
      path: "/messages/thr_1",
      session: { account: { ...sawyerAccount, role: "admin" } },
      answers: { [GET]: [{ status: 200, body: { thread: { ...asSawyer, myRole: "observer" }, messages: [question] } }] },
    });
    expect(wrapper.find('[data-test="send-form"]').exists()).toBe(false);
    expect(wrapper.text()).toContain("admin desk");
  });
});

import { afterEach, describe, expect, it } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia, setActivePinia } from "pinia";
import { createMemoryHistory } from "vue-router";
import { reportEndpoints } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { appPlugins } from "../../test/app-plugins.ts";
import { createGrainyardRouter } from "../../router.ts";
import { useSessionStore } from "../../stores/session.ts";
import { buyerAccount } from "../../test/fixtures.ts";
import ReasonDialog from "../admin/ReasonDialog.vue";
import ReportContent from "./ReportContent.vue";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

async function mountReport(
  props: { targetKind: "listing" | "message"; targetId: string; ownerId: string | null; compact?: boolean },
  reportAnswer = {
    status: 201,
    body: { report: { id: "rep_1", targetKind: props.targetKind, targetId: props.targetId, status: "open" } } as unknown,
  },
) {
  const requests: { key: string; body: unknown }[] = [];
  transport.useFetch((async (url: string, init?: RequestInit) => {
    const key = `${init?.method ?? "GET"} ${String(url).split("?")[0]}`;
    requests.push({ key, body: init?.body ? JSON.parse(String(init.body)) : undefined });
    if (key === `POST ${reportEndpoints.fileReport.path}`)
      return new Response(JSON.stringify(reportAnswer.body), { status: reportAnswer.status });
    return new Response(JSON.stringify({ account: buyerAccount, csrfToken: "t" }), { status: 200 });
  }) as unknown as typeof fetch);
  const pinia = createPinia();
  setActivePinia(pinia);
  transport.useCsrfToken(() => useSessionStore(pinia).csrfToken);
  const router = createGrainyardRouter(pinia, createMemoryHistory());
  await router.push("/messages/thr_1");
  await router.isReady();
  await useSessionStore(pinia).load();
  const wrapper = mount(ReportContent, { props, global: { plugins: appPlugins(pinia, router) } });
  await flushPromises();
  return { wrapper, requests };
}

describe("report a listing or a message", () => {
  it("reports someone else's message with the reason, then thanks the reader", async () => {
    const { wrapper, requests } = await mountReport({ targetKind: "message", targetId: "msg_1", ownerId: "acc_sawyer", compact: true });
    expect(wrapper.find('[data-test="report-message"]').text()).toBe("Report");
    await wrapper.find('[data-test="report-message"]').trigger("click");
    wrapper.findComponent(ReasonDialog).vm.$emit("confirm", "Asks me to pay by bank transfer outside Grainyard.");
    await flushPromises();
    expect(requests.find((r) => r.key === `POST ${reportEndpoints.fileReport.path}`)?.body).toEqual({
      targetKind: "message",
      targetId: "msg_1",
      reason: "Asks me to pay by bank transfer outside Grainyard.",
    });
    expect(wrapper.text()).toContain("Reported. Thank you.");
  });

  it("offers nothing on the reader's own message", async () => {
    const { wrapper } = await mountReport({ targetKind: "message", targetId: "msg_2", ownerId: buyerAccount.id, compact: true });
    expect(wrapper.find('[data-test="report-message"]').exists()).toBe(false);
  });

  it("keeps the dialog open with the API's words on the reason when it is refused", async () => {
    const { wrapper } = await mountReport(
      { targetKind: "listing", targetId: "lst_1", ownerId: null },
      {
        status: 422,
        body: { error: { code: "invalid", message: "Check the reason.", fields: { reason: "Tell us what is wrong, in a few words." } } },
      },
    );
    await wrapper.find('[data-test="report-listing"]').trigger("click");
    wrapper.findComponent(ReasonDialog).vm.$emit("confirm", "x");
    await flushPromises();
    expect(wrapper.findComponent(ReasonDialog).props("fieldError")).toBe("Tell us what is wrong, in a few words.");
    expect(wrapper.findComponent(ReasonDialog).props("show")).toBe(true);
  });
});

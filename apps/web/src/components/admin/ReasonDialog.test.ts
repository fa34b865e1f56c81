import { describe, expect, it } from "vitest";
import { mount } from "@vue/test-utils";
import { nextTick } from "vue";
import ReasonDialog from "./ReasonDialog.vue";

describe("ReasonDialog", () => {
  it("refuses a reason shorter than 5 characters, then sends the trimmed reason", async () => {
    const wrapper = mount(ReasonDialog, {
      props: { show: false, title: "Send back", lead: "Say what to change.", confirmLabel: "Send back" },
      attachTo: document.body,
    });
    await wrapper.setProps({ show: true });
    await nextTick();
    const textarea = document.querySelector<HTMLTextAreaElement>('[data-test="reason-text"]')!;
    const form = document.querySelector<HTMLFormElement>('[data-test="reason-dialog"]')!;
    textarea.value = "no";
    textarea.dispatchEvent(new Event("input"));
    form.dispatchEvent(new Event("submit"));
    await nextTick();
    expect(wrapper.emitted("confirm")).toBeUndefined();
    expect(document.body.textContent).toContain("at least 5 characters");
    textarea.value = "  The second photo shows another slab.  ";
    textarea.dispatchEvent(new Event("input"));
    form.dispatchEvent(new Event("submit"));
    await nextTick();
    expect(wrapper.emitted("confirm")).toEqual([["The second photo shows another slab."]]);
    wrapper.unmount();
  });
});

import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia } from "pinia";
import naive from "naive-ui";
import LogPhotos from "./LogPhotos.vue";
import { yardApi } from "../../api/yard.ts";
import { ApiRequestError } from "../../api/errors.ts";

afterEach(() => {
  vi.restoreAllMocks();
  document.body.innerHTML = "";
});

function pick(wrapper: ReturnType<typeof mount>, files: File[]) {
  const input = wrapper.find('[data-test="log-photo-input"]');
  Object.defineProperty(input.element, "files", { value: files, configurable: true });
  return input.trigger("change");
}

describe("LogPhotos", () => {
  it("shows a failed upload as failed (no progress bar), sends the same file again on Try again, and clears it once it is up", async () => {
    const sent: File[] = [];
    const upload = vi.spyOn(yardApi, "uploadLogPhoto").mockImplementation(async (request, options) => {
      sent.push(request.body as File);
      options?.onProgress?.(1);
      if (sent.length === 1) throw new ApiRequestError(503, "unavailable", "The photo store did not answer.");
      return { photo: { id: "ph_1" } } as never;
    });
    const wrapper = mount(LogPhotos, { props: { logId: "log_1", photos: [] }, global: { plugins: [createPinia(), naive] } });
    const file = new File([new Uint8Array(16)], "butt-end.jpg", { type: "image/jpeg" });
    await pick(wrapper, [file]);
    await flushPromises();

    const item = wrapper.find('[data-test="log-photo-upload"]');
    expect(item.find("progress").exists()).toBe(false);
    expect(item.find('[data-test="upload-failed"]').text()).toContain("Upload failed. The photo store did not answer.");
    await item.find('[data-test="upload-retry"]').trigger("click");
    await flushPromises();

    expect(upload).toHaveBeenCalledTimes(2);
    expect(sent[1]).toBe(sent[0]);
    expect(sent[1]!.name).toBe(file.name);
    expect(wrapper.find('[data-test="log-photo-upload"]').exists()).toBe(false);
    expect(wrapper.emitted("changed")).toHaveLength(1);
  });

  it("offers no retry for a file refused before sending, and lets it be dismissed", async () => {
    const upload = vi.spyOn(yardApi, "uploadLogPhoto");
    const wrapper = mount(LogPhotos, { props: { logId: "log_1", photos: [] }, global: { plugins: [createPinia(), naive] } });
    await pick(wrapper, [new File(["notes"], "notes.txt", { type: "text/plain" })]);
    await flushPromises();
    expect(upload).not.toHaveBeenCalled();
    expect(wrapper.find('[data-test="upload-failed"]').text()).toContain("Not uploaded. “notes.txt” is not a photo we can take");
    expect(wrapper.find('[data-test="upload-retry"]').exists()).toBe(false);
    await wrapper.find(".log-photos__dismiss").trigger("click");
    expect(wrapper.find('[data-test="log-photo-upload"]').exists()).toBe(false);
  });
});

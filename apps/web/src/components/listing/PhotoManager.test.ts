import { afterEach, describe, expect, it } from "vitest";
import { mount } from "@vue/test-utils";
import { createPinia } from "pinia";
import naive from "naive-ui";
import PhotoManager from "./PhotoManager.vue";
import type { DraftPhoto } from "../../offline/listing-draft.ts";

afterEach(() => {
  document.body.innerHTML = "";
});

/** A picked file of a given size (the bytes themselves do not matter before sending). */
function picked(name: string, type: string, size: number): File {
  const file = new File([new Uint8Array(8)], name, { type });
  Object.defineProperty(file, "size", { value: size });
  return file;
}

describe("PhotoManager", () => {
  it("sends on only the photos it can take, and says why the others stay behind, before any upload", async () => {
    const wrapper = mount(PhotoManager, {
      props: { photos: [], progress: {} },
      global: { plugins: [createPinia(), naive] },
      attachTo: document.body,
    });
    const input = wrapper.find('[data-test="photo-input"]');
    const files = [
      picked("face.jpg", "image/jpeg", 4_000_000),
      picked("whole-roll.jpg", "image/jpeg", 50 * 1024 * 1024),
      picked("notes.txt", "text/plain", 900),
    ];
    Object.defineProperty(input.element, "files", { value: files, configurable: true });
    await input.trigger("change");

    expect(wrapper.emitted("add")).toEqual([[[files[0]]]]);
    const notice = wrapper.find(".photos__notice").text();
    expect(notice).toContain("“whole-roll.jpg” is 50.0 MB; photos can be at most 25 MB.");
    expect(notice).toContain("“notes.txt” is not a photo we can take");
  });

  it("shows a failed upload as failed, with no progress bar and a Try again button, and a placeholder for a picture it cannot draw", async () => {
    const photo = (key: string, rejected: string | null): DraftPhoto => ({
      key,
      serverId: null,
      blob: new Blob(["not really a jpeg"], { type: "image/jpeg" }),
      fileName: `${key}.jpg`,
      altText: "",
      altTextSynced: true,
      smallUrl: null,
      rejected,
    });
    const wrapper = mount(PhotoManager, {
      // The failed photo went up in full before the server refused it: its progress reads 1.
      props: { photos: [photo("going", null), photo("failed", "The connection dropped.")], progress: { going: 0.4, failed: 1 } },
      global: { plugins: [createPinia(), naive] },
      attachTo: document.body,
    });
    const [going, failed] = wrapper.findAll('[data-test="photo-item"]');
    expect(going!.find('[data-test="photo-progress"]').attributes("value")).toBe("40");
    expect(going!.text()).toContain("Uploading 40 %");
    expect(going!.find('[data-test="upload-failed"]').exists()).toBe(false);

    expect(failed!.find('[data-test="photo-progress"]').exists()).toBe(false);
    expect(failed!.find('[data-test="upload-failed"]').text()).toContain("Upload failed. The connection dropped.");
    await failed!.find('[data-test="upload-retry"]').trigger("click");
    expect(wrapper.emitted("retry")).toEqual([["failed"]]);

    // The browser could not draw it: a placeholder instead of a broken image.
    expect(failed!.find('[data-test="photo-placeholder"]').exists()).toBe(false);
    await failed!.find("img").trigger("error");
    expect(failed!.find("img").exists()).toBe(false);
    expect(failed!.find('[data-test="photo-placeholder"]').exists()).toBe(true);
  });

  it("offers no retry while the listing cannot be changed", () => {
    const wrapper = mount(PhotoManager, {
      props: {
        photos: [
          {
            key: "p",
            serverId: null,
            blob: new Blob(["x"]),
            fileName: "p.jpg",
            altText: "",
            altTextSynced: true,
            smallUrl: null,
            rejected: "Too big.",
          },
        ],
        progress: {},
        disabled: true,
      },
      global: { plugins: [createPinia(), naive] },
    });
    expect(wrapper.find('[data-test="upload-failed"]').text()).toContain("Remove it and choose another photo.");
    expect(wrapper.find('[data-test="upload-retry"]').exists()).toBe(false);
  });
});

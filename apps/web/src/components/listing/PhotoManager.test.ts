import { afterEach, describe, expect, it } from "vitest";
import { mount } from "@vue/test-utils";
import { createPinia } from "pinia";
import naive from "naive-ui";
import PhotoManager from "./PhotoManager.vue";

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
});

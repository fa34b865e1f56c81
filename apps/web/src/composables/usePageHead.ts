import { computed } from "vue";
import { useHead, type ReactiveHead, type ResolvableMeta } from "@unhead/vue";
import type { PageHead } from "../seo/head.ts";

/**
 * Puts a public page's head in place (title, description, canonical link, preview tags, JSON-LD)
 * and keeps it in step with the page's data. Runs the same on the server and in the browser.
 */
export function usePageHead(head: () => PageHead | null) {
  useHead(
    computed<ReactiveHead>(() => {
      const value = head();
      if (!value) return {};
      return {
        title: value.title,
        link: [{ rel: "canonical", href: value.canonical }],
        // Our tags carry either `name` or `property`; unhead's type spells out every known name.
        meta: value.meta as ResolvableMeta[],
        script: value.jsonLd.map((document, index) => ({
          key: `json-ld-${index}`,
          type: "application/ld+json",
          textContent: JSON.stringify(document),
        })),
      };
    }),
  );
}

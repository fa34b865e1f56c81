import { PiniaColada } from "@pinia/colada";
import { createHead } from "@unhead/vue/client";
import type { Pinia } from "pinia";
import type { Plugin } from "vue";
import type { Router } from "vue-router";

/** The plugins the real app installs (app.ts), for mounting a view or component in a unit test. */
export function appPlugins(pinia: Pinia, router: Router): (Plugin | [Plugin, ...unknown[]])[] {
  return [pinia, [PiniaColada, { queryOptions: { staleTime: 30_000 } }], router, createHead()];
}

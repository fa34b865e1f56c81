import { reactive, ref } from "vue";
import { fieldMessages } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";

/** Anything with zod's safeParse: the contracts' schemas. */
interface Validator<T> {
  safeParse(input: unknown): { success: true; data: T } | { success: false; error: Parameters<typeof fieldMessages>[0] };
}

/**
 * Per-field messages for one form, from two sources: the shared zod schema (checked in the browser
 * before sending) and the API's `error.fields` (a 422 answer). A message that belongs to no field
 * shows above the form as `formError`.
 */
export function useFormErrors() {
  const fields = reactive<Record<string, string>>({});
  const formError = ref<ApiRequestError | null>(null);

  function clear(field?: string) {
    if (field) {
      delete fields[field];
      return;
    }
    for (const key of Object.keys(fields)) delete fields[key];
    formError.value = null;
  }

  function setFields(messages: Record<string, string>) {
    for (const [key, message] of Object.entries(messages)) fields[key] = message;
  }

  /** Checks values against the schema; returns the parsed data, or null after filling `fields`. */
  function validate<T>(schema: Validator<T>, values: unknown): T | null {
    clear();
    const result = schema.safeParse(values);
    if (result.success) return result.data;
    setFields(fieldMessages(result.error));
    return null;
  }

  /** Shows an API failure: field messages beside the fields, the message above the form. */
  function fromApi(error: unknown) {
    const apiError = toApiRequestError(error);
    setFields(apiError.fields);
    formError.value = apiError;
  }

  function message(field: string): string | undefined {
    return fields[field];
  }

  function status(field: string): "error" | undefined {
    return fields[field] ? "error" : undefined;
  }

  /** Moves focus to the first field (in form order) that has a message; ids equal field names. */
  function focusFirst(order: readonly string[]) {
    const first = order.find((key) => fields[key]);
    if (first && typeof document !== "undefined") document.getElementById(first)?.focus();
  }

  return { fields, formError, clear, validate, fromApi, message, status, focusFirst };
}

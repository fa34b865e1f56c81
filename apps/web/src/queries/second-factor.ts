/**
 * The signed-in sawyer's or admin's second factor: whether it is on, starting a set-up (the QR code
 * and the secret as text), switching it on with a first code (the recovery codes come back once) and
 * removing it. A change marks the status stale and re-reads the session (an admin's desk opens or
 * closes with it).
 */
import { computed } from "vue";
import { useMutation, useQuery, useQueryCache } from "@pinia/colada";
import {
  secondFactorEndpoints,
  type SecondFactorRecoveryCodes,
  type SecondFactorRemovalInput,
  type SecondFactorSetUp,
  type SecondFactorStatus,
} from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { useSessionStore } from "../stores/session.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

export function useSecondFactorStatus() {
  const client = useClient(secondFactorEndpoints);
  const session = useSessionStore();
  const accountId = computed(() => session.account?.id ?? "");
  return useQuery<SecondFactorStatus, ApiRequestError>({
    key: () => queryKeys.secondFactor.status(accountId.value),
    query: ({ signal }) => client.getSecondFactor(undefined, { signal }).catch(rethrow),
    enabled: () => accountId.value !== "",
  });
}

/**
 * After it was switched on or off: the status again, and the session (an admin's restriction follows it).
 * The set-up calls it itself once the recovery codes are on screen (re-reading the status first would
 * replace the set-up, and its answer with it, before the codes could show).
 */
export function useSecondFactorChanged() {
  const cache = useQueryCache();
  const session = useSessionStore();
  return async () => {
    await Promise.all([markStale(cache, { key: queryKeys.secondFactor.status(session.account?.id ?? "") }), session.load()]);
  };
}

export function useStartSecondFactorSetUp() {
  const client = useClient(secondFactorEndpoints);
  return useMutation<SecondFactorSetUp, void, ApiRequestError>({
    mutation: () => client.startSecondFactorSetUp().catch(rethrow),
  });
}

/** Switches it on; the caller shows the recovery codes, then calls `useSecondFactorChanged`'s function. */
export function useConfirmSecondFactor() {
  const client = useClient(secondFactorEndpoints);
  return useMutation<SecondFactorRecoveryCodes, string, ApiRequestError>({
    mutation: (code) => client.confirmSecondFactor({ body: { code } }).catch(rethrow),
  });
}

export function useRemoveSecondFactor() {
  const client = useClient(secondFactorEndpoints);
  const afterChange = useSecondFactorChanged();
  return useMutation<SecondFactorStatus, SecondFactorRemovalInput, ApiRequestError>({
    mutation: (input) => client.removeSecondFactor({ body: input }).catch(rethrow),
    onSuccess: () => afterChange(),
  });
}

import { defineStore } from "pinia";
import { useQueryCache } from "@pinia/colada";
import { computed, ref } from "vue";
import type { Account, Role, SessionState, SignInInput } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { accountsApi } from "../api/accounts.ts";
import { isPersonalKey } from "../queries/keys.ts";
import { secondFactorApi } from "../api/second-factor.ts";

/** Where each role lands after signing in. */
const roleHome: Record<Role, string> = {
  sawyer: "/yard",
  buyer: "/account",
  admin: "/admin",
};

/** The page where sawyers and admins set up or remove their second factor. */
export const SECURITY_PATH = "/account/security";

type LoadStatus = "idle" | "loading" | "ready" | "error";

export const useSessionStore = defineStore("session", () => {
  const account = ref<Account | null>(null);
  const csrfToken = ref<string | null>(null);
  const status = ref<LoadStatus>("idle");
  const loadError = ref<ApiRequestError | null>(null);
  /** Between a right password and the code of an account with a second factor: whose code is awaited. */
  const secondStep = ref<SessionState["secondStep"]>(null);
  /** A signed-in admin without a second factor: only its set-up is open. */
  const secondFactorSetUpNeeded = ref(false);
  let pending: Promise<void> | null = null;

  const isSignedIn = computed(() => account.value !== null);
  const role = computed<Role | null>(() => account.value?.role ?? null);
  const isBuyer = computed(() => role.value === "buyer");
  const isSawyer = computed(() => role.value === "sawyer");
  const isAdmin = computed(() => role.value === "admin");
  const homePath = computed(() => (secondFactorSetUpNeeded.value ? SECURITY_PATH : role.value ? roleHome[role.value] : "/"));

  const queryCache = useQueryCache();

  function apply(state: SessionState) {
    // Someone else now (signed out, or another account): nothing of the last person's stays in memory.
    // (From no one to someone there is nothing to forget, and the page's hydrated answers stay.)
    if (account.value && account.value.id !== state.account?.id) {
      for (const entry of queryCache.getEntries()) if (isPersonalKey(entry.key)) queryCache.remove(entry);
    }
    account.value = state.account;
    csrfToken.value = state.csrfToken;
    secondStep.value = state.secondStep ?? null;
    secondFactorSetUpNeeded.value = state.secondFactorSetUpNeeded ?? false;
    status.value = "ready";
    loadError.value = null;
  }

  /** Reads who is signed in and a fresh anti-forgery token. Concurrent calls share one request. */
  function load(): Promise<void> {
    if (pending) return pending;
    status.value = "loading";
    pending = accountsApi
      .getSession()
      .then(apply)
      .catch((error: unknown) => {
        loadError.value = toApiRequestError(error);
        status.value = "error";
      })
      .finally(() => {
        pending = null;
      });
    return pending;
  }

  /** Loads once; later calls return at once unless the first load failed. */
  function ensureLoaded(): Promise<void> {
    if (status.value === "ready") return Promise.resolve();
    return load();
  }

  /** The password step: signed in, or (with a second factor on) `secondStep` is set and the code is awaited. */
  async function signIn(input: SignInInput): Promise<Account | null> {
    apply(await accountsApi.signIn({ body: input }));
    return account.value;
  }

  /** The code step: a code from the authenticator app or a recovery code. */
  async function signInWithCode(code: string): Promise<Account | null> {
    apply(await secondFactorApi.signInSecondStep({ body: { code } }));
    return account.value;
  }

  async function signOut(): Promise<void> {
    apply(await accountsApi.signOut());
  }

  /** After the API returns a changed account (e.g. the yard profile), keep the store in step. */
  function updateAccount(next: Account) {
    if (account.value && account.value.id === next.id) account.value = next;
  }

  return {
    account,
    csrfToken,
    status,
    loadError,
    isSignedIn,
    role,
    isBuyer,
    isSawyer,
    isAdmin,
    homePath,
    secondStep,
    secondFactorSetUpNeeded,
    load,
    ensureLoaded,
    signIn,
    signInWithCode,
    signOut,
    updateAccount,
  };
});

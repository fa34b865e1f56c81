/**
 * Every API path, in one place, so web and api cannot drift apart.
 * All live under /api/v1 except health.
 */
export const API_PREFIX = "/api/v1";

export const apiPaths = {
  health: "/api/health",
  session: `${API_PREFIX}/session`,
  accounts: `${API_PREFIX}/accounts`,
  emailVerification: `${API_PREFIX}/email-verification`,
  emailVerificationResend: `${API_PREFIX}/email-verification/resend`,
  passwordResetRequests: `${API_PREFIX}/password-reset-requests`,
  passwordResets: `${API_PREFIX}/password-resets`,
  yard: `${API_PREFIX}/yard`,
  yardById: (sawyerId: string) => `${API_PREFIX}/yards/${encodeURIComponent(sawyerId)}`,
  adminAccounts: `${API_PREFIX}/admin/accounts`,
} as const;

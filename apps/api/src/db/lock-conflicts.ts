/**
 * MariaDB's answers when two transactions want the same rows: a deadlock (InnoDB rolled one back,
 * errno 1213) or a lock wait that timed out (errno 1205). Either way the statement did nothing.
 */
export function isLockConflict(error: unknown): boolean {
  const errno =
    (error as { errno?: number; driverError?: { errno?: number } } | null)?.errno ??
    (error as { driverError?: { errno?: number } } | null)?.driverError?.errno;
  return errno === 1213 || errno === 1205;
}

/**
 * Runs one step of a sweep that other API instances may be running at the same moment. A lock
 * conflict is tried again a few times (after a short, random pause); if it persists, the step is
 * skipped (`null`): another instance is on it, or the next sweep will be.
 */
export async function retryOnLockConflict<T>(step: () => Promise<T>, attempts = 3): Promise<T | null> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await step();
    } catch (error) {
      if (!isLockConflict(error)) throw error;
      if (attempt >= attempts) return null;
      await new Promise((resolve) => setTimeout(resolve, 5 + Math.random() * 20 * attempt));
    }
  }
}

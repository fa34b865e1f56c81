/**
 * Work that must not sit on a request's path: sending an e-mail whose timing would tell an outsider
 * something (whether an address has an account), or that the caller need not wait for. A task runs
 * after the current request's answer is written; its failure goes to the log, never to the caller.
 *
 * This is in-process: a task still pending when the process dies is lost. E-mails do not depend on
 * it: they are rows of the outbox (services/mail-outbox.ts), written in their change's transaction;
 * a lost first attempt here is made again by the outbox job.
 */
export interface BackgroundWork {
  run(kind: string, task: () => Promise<void>): void;
  /** Resolves once every task started so far has finished (tests; a graceful stop). */
  settled(): Promise<void>;
}

export function createBackgroundWork(log: { error(object: object, message: string): void }): BackgroundWork {
  const pending = new Set<Promise<void>>();
  return {
    run(kind, task) {
      const running: Promise<void> = new Promise<void>((resolve) => setImmediate(resolve))
        .then(task)
        .catch((error: unknown) => log.error({ err: error, kind }, "background task failed"))
        .finally(() => pending.delete(running));
      pending.add(running);
    },
    async settled() {
      while (pending.size) await Promise.all([...pending]);
    },
  };
}

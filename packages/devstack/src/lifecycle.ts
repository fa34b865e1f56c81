import { Interrupted, say, StackError, warn } from "./log.ts";

interface Stopper {
  name: string;
  stop: () => Promise<void>;
  timeoutMs: number;
}

const SIGNALS = ["SIGINT", "SIGTERM", "SIGHUP"] as const;

/** Prints a runner failure: a tool's multi-line report as it is, anything else as one line. */
export function reportFailure(error: unknown): void {
  const message = error instanceof Error ? error.message : String(error);
  if (error instanceof StackError && message.includes("\n")) process.stderr.write(`${message}\n`);
  else if (error instanceof StackError) process.stderr.write(`[grainyard] ✗ ${message}\n`);
  else process.stderr.write(`[grainyard] ✗ ${error instanceof Error ? (error.stack ?? message) : message}\n`);
}

function withTimeout(work: Promise<void>, ms: number, what: string): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new StackError(`${what} did not stop within ${Math.round(ms / 1000)} s`)), ms);
  });
  return Promise.race([work, timeout]).finally(() => clearTimeout(timer));
}

/**
 * One run of the stack runner from start to exit. Signal handlers are in place from the first
 * moment; everything started registers how to stop it. The first Ctrl-C (or SIGTERM/SIGHUP)
 * aborts the start-up step in progress, stops everything in reverse order without ever blocking
 * the event loop, and ends with "stopped cleanly" or a line per thing it could not stop. Signals
 * after the first are ignored (a reminder is printed when a person presses Ctrl-C again).
 */
export class Lifecycle {
  private readonly controller = new AbortController();
  private readonly stoppers: Stopper[] = [];
  private work: Promise<unknown> = Promise.resolve();
  private stopping: Promise<void> | null = null;
  private stopRequestedAt = 0;
  private stoppingNow = "";
  private epilogue: (() => void) | undefined;

  constructor(private readonly signalExitCode: number) {
    for (const signal of SIGNALS) process.on(signal, () => this.onSignal());
  }

  /** Aborted once stopping begins: long start-up steps pass it on and give up early. */
  get signal(): AbortSignal {
    return this.controller.signal;
  }

  /** Registers something to stop at the end; stopped in reverse order of registration. */
  onStop(name: string, stop: () => Promise<void>, timeoutMs = 60_000): void {
    this.stoppers.push({ name, stop, timeoutMs });
  }

  /** Printed after everything has stopped, just before the exit (the test summary). */
  setEpilogue(print: () => void): void {
    this.epilogue = print;
  }

  /**
   * Runs `main` (start-up, or a whole job). "running" keeps everything up until a signal; a number
   * stops everything and exits with it; a failure is reported, then everything stops (exit 1).
   */
  async run(main: () => Promise<number | "running">): Promise<void> {
    this.work = main();
    let result: number | "running";
    try {
      result = await this.work.then((value) => value as number | "running");
    } catch (error) {
      if (this.stopping) return; // a signal is already stopping everything; the step was cut short on purpose
      if (!(error instanceof Interrupted)) reportFailure(error);
      await this.stop(1);
      return;
    }
    if (result !== "running") await this.stop(result);
  }

  /** Something the runner depends on failed while running (the API died): stop everything, exit 1. */
  fail(message: string): void {
    if (this.stopping) return;
    warn(message);
    void this.stop(1);
  }

  private onSignal(): void {
    if (!this.stopping) {
      void this.stop(this.signalExitCode);
      return;
    }
    // The same Ctrl-C often arrives twice (from the terminal and passed on by the wrapper); a
    // person pressing it again a moment later gets told what is still being waited for.
    if (Date.now() - this.stopRequestedAt > 1000) {
      say(`still stopping${this.stoppingNow ? ` (${this.stoppingNow})` : ""}; this finishes by itself, please wait`);
      this.stopRequestedAt = Date.now();
    }
  }

  stop(code: number): Promise<void> {
    if (this.stopping) return this.stopping;
    this.stopRequestedAt = Date.now();
    this.stopping = (async () => {
      say("stopping…");
      this.controller.abort();
      // Let the interrupted start-up step end (it stops its own child) so that whatever it had
      // already started is registered before the stoppers run.
      let settled = false;
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([
        this.work.then(() => (settled = true)).catch(() => (settled = true)),
        new Promise((r) => (timer = setTimeout(r, 30_000))),
      ]);
      clearTimeout(timer);
      if (!settled) warn("a start-up step did not end within 30 s of the stop; stopping the rest anyway");
      const failures: string[] = [];
      for (const stopper of [...this.stoppers].reverse()) {
        this.stoppingNow = `waiting for ${stopper.name} to stop`;
        const started = Date.now();
        // A stop that takes a while says what it is waiting for.
        const heartbeat = setInterval(
          () => say(`still stopping: waiting for ${stopper.name} (${Math.round((Date.now() - started) / 1000)} s)`),
          10_000,
        );
        try {
          await withTimeout(stopper.stop(), stopper.timeoutMs, stopper.name);
        } catch (error) {
          failures.push(error instanceof Error ? error.message : String(error));
        } finally {
          clearInterval(heartbeat);
        }
      }
      if (failures.length === 0) say("stopped cleanly");
      else for (const failure of failures) process.stderr.write(`[grainyard] ✗ could not stop everything: ${failure}\n`);
      this.epilogue?.();
      process.exit(failures.length ? code || 1 : code);
    })();
    return this.stopping;
  }
}

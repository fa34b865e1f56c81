import { createServer } from "node:net";
import { Interrupted, StackError } from "./log.ts";

/** Resolves when nothing listens on 127.0.0.1:port; tells which port and what for when one is taken. */
export async function assertPortFree(port: number, purpose: string): Promise<void> {
  await new Promise<void>((resolvePromise, reject) => {
    const server = createServer();
    server.once("error", (error: NodeJS.ErrnoException) => {
      reject(
        new StackError(
          error.code === "EADDRINUSE"
            ? `port ${port} on 127.0.0.1 (${purpose}) is already in use — stop whatever uses it, or choose other ports with GRAINYARD_PORT_BASE.`
            : `cannot listen on 127.0.0.1:${port} (${purpose}): ${error.message}`,
        ),
      );
    });
    server.listen({ port, host: "127.0.0.1", exclusive: true }, () => server.close(() => resolvePromise()));
  });
}

/** Polls `probe` until it returns true or the time runs out; gives up at once when `signal` aborts. */
export async function waitUntil(probe: () => Promise<boolean>, timeoutMs: number, what: string, signal?: AbortSignal): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (signal?.aborted) throw new Interrupted(`waiting for ${what}`);
    // A probe that throws StackError means "give up now" (the process died); other errors mean "not yet".
    const ready = await probe().catch((error: unknown) => {
      if (error instanceof StackError) throw error;
      return false;
    });
    if (ready) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new StackError(`${what} did not become ready within ${Math.round(timeoutMs / 1000)} s.`);
}

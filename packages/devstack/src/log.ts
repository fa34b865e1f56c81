/** One-line, human-readable progress lines for the stack runner. */
export function say(line: string): void {
  process.stdout.write(`[grainyard] ${line}\n`);
}

export function warn(line: string): void {
  process.stderr.write(`[grainyard] ! ${line}\n`);
}

/** A failure the runner explains in one clear line (no stack dump) before it exits non-zero. */
export class StackError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "StackError";
  }
}

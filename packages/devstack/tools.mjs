// Running outside tools (npm, pnpm, apt-get, mariadb-install-db, vite…) the way the stack runner
// wants them run: quiet while they are quick, visible progress while they are slow (their own
// output, one line every few seconds, and a heartbeat when they say nothing), and on failure
// their relevant output with one plain sentence of what to do.
// Plain JavaScript with no dependencies: bootstrap.mjs uses it before anything is installed.
import { spawn } from "node:child_process";
import { mkdirSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";

const PREFIX = "[grainyard]";

/** One progress line of the stack runner. @param {string} line */
export function say(line) {
  process.stdout.write(`${PREFIX} ${line}\n`);
}

/** One warning line. @param {string} line */
export function warn(line) {
  process.stderr.write(`${PREFIX} ! ${line}\n`);
}

/** A failure the runner explains (no stack dump) before it exits non-zero. */
export class StackError extends Error {
  /** @param {string} message */
  constructor(message) {
    super(message);
    this.name = "StackError";
  }
}

/** An outside tool failed; `message` is the whole report: what failed, its output, what to do. */
export class ToolFailure extends StackError {
  /** @param {string} report @param {{ code: number | null, output: string }} details */
  constructor(report, details) {
    super(report);
    this.name = "ToolFailure";
    this.code = details.code;
    this.output = details.output;
  }
}

/** A step given up because the runner is stopping (Ctrl-C): not a failure to report. */
export class Interrupted extends Error {
  /** @param {string} what */
  constructor(what) {
    super(`${what} was interrupted`);
    this.name = "Interrupted";
  }
}

/** "0.8 s", "42.0 s", "3 min 05 s". @param {number} ms */
function elapsed(ms) {
  const seconds = ms / 1000;
  if (seconds < 60) return `${seconds.toFixed(1)} s`;
  const whole = Math.round(seconds);
  return `${Math.floor(whole / 60)} min ${String(whole % 60).padStart(2, "0")} s`;
}

// CSI and OSC sequences (colours, cursor moves, hyperlinks) and lone escapes.
// eslint-disable-next-line no-control-regex
const ESCAPES = /\u001b\[[0-?]*[ -/]*[@-~]|\u001b\][^\u0007\u001b]*(?:\u0007|\u001b\\)|\u001b[@-_]/g;

/** @param {string} text */
export function stripEscapes(text) {
  return text.replace(ESCAPES, "");
}

/** @param {string} text */
function splitLines(text) {
  return text.split(/\r\n|\r|\n/);
}

/** Lines worth showing: no escape codes, no blank or bar-only lines (pnpm's "+++++"). @param {string} line */
function isShowable(line) {
  return /[A-Za-z0-9]/.test(line);
}

const ERRORISH =
  /\b(error|err!|fatal|failed|failure|cannot|can't|could not|unable|refused|denied|not found|no such)\b|^E: |^npm error|^ERR_/i;

/**
 * The part of a tool's output that explains a failure, as lines: escape codes removed, repeats
 * folded ("… (×12)"), and when it is long, the error-looking lines from the start plus the end.
 * @param {string} output
 * @param {number} [maxLines]
 * @returns {string[]}
 */
export function relevantOutput(output, maxLines = 40) {
  /** @type {{ text: string, times: number }[]} */
  const folded = [];
  for (const raw of splitLines(stripEscapes(output))) {
    const line = raw.trimEnd();
    if (!isShowable(line)) continue;
    const last = folded.at(-1);
    if (last && last.text === line) last.times += 1;
    // pnpm rewrites one progress line again and again; only its last state matters.
    else if (last && /^Progress: /.test(last.text) && /^Progress: /.test(line)) last.text = line;
    else folded.push({ text: line, times: 1 });
  }
  const lines = folded.map(({ text, times }) => (times > 1 ? `${text} (×${times})` : text));
  if (lines.length <= maxLines) return lines;
  const tailLength = Math.max(10, maxLines - 12);
  const head = lines.slice(0, lines.length - tailLength);
  const errors = [...new Set(head.filter((line) => ERRORISH.test(line)))].slice(-10);
  const leftOut = head.length - errors.length;
  return [...errors, `… ${leftOut} more line${leftOut === 1 ? "" : "s"} …`, ...lines.slice(-tailLength)];
}

/** @param {string} argument */
function shellWord(argument) {
  return /^[\w@%+=:,./-]+$/.test(argument) ? argument : `'${argument.replace(/'/g, `'\\''`)}'`;
}

/**
 * The report printed when an outside tool fails: what failed and how, the command, the tool's
 * relevant output, where the whole output is, and one sentence of what to do.
 * @param {{ label: string, command: string, args: string[], code: number | null, signal?: string | null, output: string,
 *   advice: string, seconds?: number, logFile?: string, maxLines?: number }} failure
 */
export function failureReport(failure) {
  const how = failure.code === null ? `was stopped by ${failure.signal ?? "a signal"}` : `failed (exit ${failure.code})`;
  const after = failure.seconds === undefined ? "" : ` after ${elapsed(failure.seconds * 1000)}`;
  const shown = relevantOutput(failure.output, failure.maxLines);
  const lines = [
    `${PREFIX} ✗ ${failure.label} ${how}${after}`,
    `${PREFIX}   command: ${[failure.command, ...failure.args].map(shellWord).join(" ")}`,
    ...(shown.length ? shown.map((line) => `${PREFIX}   │ ${line}`) : [`${PREFIX}   │ (the tool printed nothing)`]),
    ...(failure.logFile ? [`${PREFIX}   whole output: ${failure.logFile}`] : []),
    `${PREFIX}   What to do: ${failure.advice}`,
  ];
  return lines.join("\n");
}

/** @param {string} output */
export function looksLikeNetworkTrouble(output) {
  return /\b(ETIMEDOUT|ENOTFOUND|EAI_AGAIN|ECONNRESET|ECONNREFUSED|ENETUNREACH|EHOSTUNREACH|socket hang up|Temporary failure resolving|Could not resolve|Failed to fetch|Connection timed out|Network is unreachable)\b/i.test(
    output,
  );
}

/**
 * The colour settings children should see. With CI set, or output that is not a terminal, or a
 * FORCE_COLOR of 0/false: NO_COLOR=1 and no FORCE_COLOR at all (several colour libraries read any
 * FORCE_COLOR, "0" included, as "force colours on", and some turn colours on whenever CI is set).
 * A terminal outside CI keeps what the user has.
 * @param {NodeJS.ProcessEnv} env
 * @param {boolean} outputIsTerminal
 * @returns {NodeJS.ProcessEnv}
 */
export function colourEnvironment(env, outputIsTerminal) {
  const next = { ...env };
  const ci = env.CI !== undefined && env.CI !== "" && env.CI !== "0" && env.CI.toLowerCase() !== "false";
  const forcedOff = env.FORCE_COLOR === "0" || env.FORCE_COLOR?.toLowerCase() === "false";
  const userForcedOn = env.FORCE_COLOR !== undefined && !forcedOff;
  if (ci || forcedOff || env.NO_COLOR || (!outputIsTerminal && !userForcedOn)) {
    delete next.FORCE_COLOR;
    next.NO_COLOR = "1";
  }
  return next;
}

/**
 * @typedef {object} ToolRun
 * @property {string} label what the step does, e.g. "installing pnpm 12.4.2 with npm"
 * @property {string} command
 * @property {string[]} args
 * @property {string} [cwd]
 * @property {NodeJS.ProcessEnv} [env]
 * @property {(output: string) => string} [advice] one sentence of what to do, from the tool's output
 * @property {boolean} [announce] print "<label>…" at the start (default true)
 * @property {number} [quietMs] show nothing more while the step is this young (default 4 s)
 * @property {number} [progressEveryMs] at most one line of the tool's output this often (default 5 s)
 * @property {number} [heartbeatMs] say "still …" after this long without output (default 15 s)
 * @property {number} [timeoutMs] give up (and stop the tool) after this long
 * @property {AbortSignal} [signal] stops the tool and rejects with Interrupted
 * @property {(line: string) => void} [onLine] sees every output line as it comes
 * @property {string} [logFile] where the whole output is written when the step fails
 */

/**
 * Runs an outside tool to completion with visible progress; resolves with its output, rejects
 * with a ToolFailure carrying the report (or Interrupted when `signal` aborts it).
 * @param {ToolRun} run
 * @returns {Promise<{ stdout: string, output: string, seconds: number }>}
 */
export function runTool(run) {
  const { label, command, args, quietMs = 4000, progressEveryMs = 5000, heartbeatMs = 15_000 } = run;
  if (run.announce !== false) say(`${label}…`);
  const started = Date.now();
  return new Promise((resolvePromise, reject) => {
    if (run.signal?.aborted) return reject(new Interrupted(label));
    // Its own process group: a terminal's Ctrl-C reaches only the runner, which stops the tool
    // (and whatever the tool started) itself, and a repeated Ctrl-C cannot cut a shutdown step short.
    const child = spawn(command, args, { cwd: run.cwd, env: run.env, stdio: ["ignore", "pipe", "pipe"], detached: true });
    const stopTool = () => {
      try {
        if (child.pid) process.kill(-child.pid, "SIGTERM");
      } catch {
        // already gone
      }
    };
    let stdout = "";
    let output = "";
    /** @type {Record<string, string>} */
    const partial = { out: "", err: "" };
    let latest = "";
    let shown = "";
    let lastOutputAt = started;
    let lastShownAt = 0;
    let lastHeartbeatAt = started;
    let timedOut = false;
    /** @param {"out" | "err"} stream @param {string} chunk @param {boolean} [flush] */
    const take = (stream, chunk, flush = false) => {
      const pieces = splitLines(partial[stream] + chunk);
      partial[stream] = flush ? "" : (pieces.pop() ?? "");
      for (const piece of pieces) {
        const line = stripEscapes(piece).trimEnd();
        if (!isShowable(line)) continue;
        latest = line;
        lastOutputAt = Date.now();
        run.onLine?.(line);
      }
    };
    child.stdout.setEncoding("utf8");
    child.stderr.setEncoding("utf8");
    child.stdout.on("data", (chunk) => {
      stdout += chunk;
      output += chunk;
      take("out", chunk);
    });
    child.stderr.on("data", (chunk) => {
      output += chunk;
      take("err", chunk);
    });
    const ticker = setInterval(
      () => {
        const now = Date.now();
        if (now - started < quietMs) return;
        if (latest && latest !== shown && now - lastShownAt >= progressEveryMs) {
          const text = latest.length > 150 ? `${latest.slice(0, 147)}…` : latest;
          say(`  │ ${text}  (${elapsed(now - started)})`);
          shown = latest;
          lastShownAt = now;
          lastHeartbeatAt = now;
        } else if (now - lastOutputAt >= heartbeatMs && now - lastHeartbeatAt >= heartbeatMs) {
          say(`  … still ${label} (${elapsed(now - started)}; no output for ${Math.round((now - lastOutputAt) / 1000)} s)`);
          lastHeartbeatAt = now;
        }
      },
      Math.max(50, Math.min(1000, progressEveryMs, heartbeatMs)),
    );
    const timeout = run.timeoutMs
      ? setTimeout(() => {
          timedOut = true;
          stopTool();
        }, run.timeoutMs)
      : undefined;
    const onAbort = stopTool;
    run.signal?.addEventListener("abort", onAbort, { once: true });
    const finish = () => {
      clearInterval(ticker);
      clearTimeout(timeout);
      run.signal?.removeEventListener("abort", onAbort);
    };
    let settled = false;
    child.on("error", (error) => {
      if (settled) return;
      settled = true;
      finish();
      const missing = /** @type {NodeJS.ErrnoException} */ (error).code === "ENOENT";
      const message = missing ? `${command} was not found (it is not installed, or not on PATH)` : error.message;
      reject(
        new ToolFailure(
          [
            `${PREFIX} ✗ ${label} could not start: ${message}`,
            `${PREFIX}   command: ${[command, ...args].map(shellWord).join(" ")}`,
            `${PREFIX}   What to do: ${missing ? `install ${command} or put it on PATH, then run the command again.` : "fix what the message says, then run the command again."}`,
          ].join("\n"),
          { code: null, output: message },
        ),
      );
    });
    child.on("close", (code, signal) => {
      if (settled) return;
      settled = true;
      finish();
      take("out", "", true);
      take("err", "", true);
      const seconds = (Date.now() - started) / 1000;
      if (run.signal?.aborted) return reject(new Interrupted(label));
      if (code === 0) {
        if (run.announce !== false && Date.now() - started >= quietMs) say(`✓ ${label} (${elapsed(Date.now() - started)})`);
        return resolvePromise({ stdout, output, seconds });
      }
      const shownOutput = timedOut ? `${output}\n(stopped by the stack runner after ${elapsed(run.timeoutMs ?? 0)})` : output;
      let logFile;
      // The whole output goes to a file when the report had to leave lines out.
      if (run.logFile && relevantOutput(shownOutput).some((line) => /^… \d+ more lines? …$/.test(line))) {
        try {
          mkdirSync(dirname(run.logFile), { recursive: true });
          writeFileSync(run.logFile, stripEscapes(shownOutput));
          logFile = run.logFile;
        } catch {
          logFile = undefined;
        }
      }
      reject(
        new ToolFailure(
          failureReport({
            label,
            command,
            args,
            code,
            signal,
            output: shownOutput,
            seconds,
            logFile,
            advice: timedOut
              ? `It did not finish within ${elapsed(run.timeoutMs ?? 0)}; see what it was doing above, fix that and run the command again.`
              : (run.advice?.(output) ?? "Fix what the tool reports above and run the command again."),
          }),
          { code, output },
        ),
      );
    });
  });
}

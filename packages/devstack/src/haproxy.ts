import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { runTool } from "../tools.mjs";
import { aptInstall, needsRoot } from "./apt.ts";
import { StackError } from "./log.ts";
import { waitUntil } from "./ports.ts";
import { startProcess, type ManagedProcess } from "./processes.ts";
import { connect } from "node:net";

const HAPROXY = "/usr/sbin/haproxy";

/** Installs Debian's haproxy when missing. Never starts the system service: the runner starts its own. */
export async function ensureHaproxyInstalled(signal?: AbortSignal): Promise<string> {
  if (existsSync(HAPROXY)) return HAPROXY;
  if (process.getuid?.() !== 0) throw needsRoot(["haproxy"], "for several API instances");
  await aptInstall(["haproxy"], { why: "for several API instances", noServiceStart: true, signal });
  if (!existsSync(HAPROXY))
    throw new StackError(
      "apt-get installed haproxy, but /usr/sbin/haproxy is missing: run `dpkg -L haproxy | grep bin/` to see where it went.",
    );
  return HAPROXY;
}

export interface Backend {
  name: string;
  port: number;
}

/**
 * The load balancer's configuration: HTTP on 127.0.0.1:`port`, round robin over the API instances
 * on their own loopback ports. Each instance is asked for /api/health/serving (its own answer, no
 * shared part asked) every second and taken out after three failed checks; a check may take 5 s (a
 * busy machine), while a refused connection fails it at once (a stopping instance closes its port at
 * once, so it is out before it exits). A request whose connection to an instance fails is sent to another (always safe: nothing
 * reached the instance); one whose instance closed without answering is sent again only when it is
 * a GET or HEAD (a POST may have done its work). Client addresses travel in X-Forwarded-For.
 */
export function haproxyConfig(options: { port: number; backends: Backend[] }): string {
  if (options.backends.length === 0) throw new Error("haproxyConfig needs at least one API instance");
  return [
    "# Written by Grainyard's stack runner on each start (packages/devstack/src/haproxy.ts). Do not edit.",
    "global",
    "  maxconn 4096",
    "  log stderr format short local0 notice",
    "",
    "defaults",
    "  mode http",
    "  log global",
    "  option dontlognull",
    "  timeout connect 2s",
    "  timeout client 60s",
    "  timeout server 60s",
    "  timeout http-request 10s",
    "  timeout http-keep-alive 5s",
    "  timeout check 5s",
    // Connection attempts per request, and each one after a failure on another instance.
    "  retries 3",
    "  option redispatch 1",
    "",
    "frontend grainyard",
    `  bind 127.0.0.1:${options.port}`,
    // Only the balancer's own X-Forwarded-For reaches the API: a client's would be believed.
    "  http-request del-header X-Forwarded-For",
    "  option forwardfor",
    "  default_backend api",
    "",
    "backend api",
    "  balance roundrobin",
    "  retry-on conn-failure empty-response",
    // Only requests that change nothing are sent again once an instance may have seen them.
    "  http-request disable-l7-retry unless METH_GET || METH_HEAD",
    "  option httpchk",
    // The instance's own check: it asks nothing shared (database, mail, payments), which every
    // instance shares, so a shared part down never takes them all out ("degraded" is not "down").
    "  http-check send meth GET uri /api/health/serving",
    "  http-check expect status 200",
    "  default-server inter 1s fastinter 250ms fall 3 rise 1",
    ...options.backends.map((backend) => `  server ${backend.name} 127.0.0.1:${backend.port} check`),
    "",
  ].join("\n");
}

function accepts(port: number): Promise<boolean> {
  return new Promise((resolvePromise) => {
    const socket = connect({ port, host: "127.0.0.1" });
    socket.once("connect", () => {
      socket.destroy();
      resolvePromise(true);
    });
    socket.once("error", () => resolvePromise(false));
  });
}

/**
 * Writes the configuration into `dir`, checks it with `haproxy -c`, and starts HAProxy in the
 * foreground in its own process group (its log in `dir/haproxy.log`). SIGTERM stops it at once.
 */
export async function startHaproxy(options: {
  dir: string;
  port: number;
  backends: Backend[];
  signal?: AbortSignal;
  track?: (name: string, stop: () => Promise<void>) => void;
}): Promise<ManagedProcess> {
  const binary = await ensureHaproxyInstalled(options.signal);
  mkdirSync(options.dir, { recursive: true });
  const configFile = join(options.dir, "haproxy.cfg");
  writeFileSync(configFile, haproxyConfig(options));
  await runTool({
    label: "haproxy -c",
    command: binary,
    args: ["-c", "-q", "-f", configFile],
    announce: false,
    advice: () => `The generated ${configFile} was refused by HAProxy: report it with the output above.`,
    signal: options.signal,
  });
  const haproxy = startProcess(binary, ["-db", "-f", configFile], { logFile: join(options.dir, "haproxy.log") });
  options.track?.("HAProxy", () => haproxy.stop());
  let exitCode: number | null = null;
  void haproxy.exited.then((code) => (exitCode = code));
  await waitUntil(
    async () => {
      if (exitCode !== null)
        throw new StackError(`HAProxy stopped while starting (exit ${exitCode}); see ${join(options.dir, "haproxy.log")}`);
      return accepts(options.port);
    },
    15_000,
    "HAProxy",
    options.signal,
  );
  return haproxy;
}

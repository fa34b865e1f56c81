import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createServer, request, type IncomingMessage, type Server } from "node:http";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { ensureHaproxyInstalled, haproxyConfig, startHaproxy } from "./haproxy.ts";
import { instanceCount, instancePorts } from "./instances.ts";
import type { ManagedProcess } from "./processes.ts";
import { testPortBase } from "./runner-harness.ts";

const dir = mkdtempSync(join(tmpdir(), "devstack-haproxy-"));
const stops: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const stop of stops.reverse()) await stop().catch(() => undefined);
  rmSync(dir, { recursive: true, force: true });
});

describe("GRAINYARD_INSTANCES", () => {
  it("is 1 unless set, and refuses what is not 1 to 9", () => {
    expect(instanceCount(undefined)).toBe(1);
    expect(instanceCount("")).toBe(1);
    expect(instanceCount("3")).toBe(3);
    for (const wrong of ["0", "10", "two", "1.5", "-2"]) expect(() => instanceCount(wrong)).toThrow(/GRAINYARD_INSTANCES/);
    expect(instancePorts(5080, 3)).toEqual([5121, 5122, 5123]);
  });
});

describe("the HAProxy configuration", () => {
  const config = haproxyConfig({
    port: 5080,
    backends: [
      { name: "api-1", port: 5121 },
      { name: "api-2", port: 5122 },
    ],
  });

  it("balances round robin over each instance, checked on /api/health/serving, on loopback only", () => {
    expect(config).toContain("bind 127.0.0.1:5080\n");
    expect(config).toContain("balance roundrobin");
    expect(config).toContain("http-check send meth GET uri /api/health/serving");
    expect(config).toContain("server api-1 127.0.0.1:5121 check");
    expect(config).toContain("server api-2 127.0.0.1:5122 check");
    expect(config).not.toMatch(/bind (?!127\.0\.0\.1:)/);
  });

  it("retries failed connections on another instance, and a request left unanswered only when it is a GET or HEAD", () => {
    expect(config).toContain("retry-on conn-failure empty-response");
    expect(config).toContain("option redispatch 1");
    expect(config).toContain("http-request disable-l7-retry unless METH_GET || METH_HEAD");
  });

  it("refuses an empty list of instances", () => {
    expect(() => haproxyConfig({ port: 5080, backends: [] })).toThrow();
  });

  it("is accepted by Debian's haproxy (haproxy -c)", async () => {
    const binary = await ensureHaproxyInstalled();
    const file = join(dir, "checked.cfg");
    writeFileSync(file, config);
    const check = spawnSync(binary, ["-c", "-f", file], { encoding: "utf8" });
    expect(check.stderr + check.stdout).not.toMatch(/ALERT/);
    expect(check.status).toBe(0);
  });
});

/** A tiny HTTP server that names itself, or closes the connection without answering when told to. */
function backend(name: string, port: number, seen: string[]): Promise<Server> {
  return new Promise((resolvePromise) => {
    const server = createServer((req, res) => {
      if (req.url === "/api/health/serving") return void res.end("ok");
      seen.push(`${name} ${req.method}`);
      if (req.url === "/drop" && name === "dropper") return void req.socket.destroy();
      res.setHeader("x-grainyard-instance", name);
      res.end(name);
    });
    server.listen(port, "127.0.0.1", () => resolvePromise(server));
  });
}

function send(port: number, method: string, path: string): Promise<{ status: number; instance?: string }> {
  return new Promise((resolvePromise, reject) => {
    const req = request({ host: "127.0.0.1", port, method, path, agent: false }, (res: IncomingMessage) => {
      res.resume();
      res.on("end", () => resolvePromise({ status: res.statusCode ?? 0, instance: res.headers["x-grainyard-instance"] as string }));
    });
    req.on("error", reject);
    req.end();
  });
}

describe("HAProxy started by the runner", () => {
  // Ports: the test base + 30 (HAProxy) and + 31 … + 33 (backends).
  const base = testPortBase() + 30;
  let haproxy: ManagedProcess;
  const seen: string[] = [];

  it("sends requests round robin, skips an instance whose port is closed, and stops on SIGTERM", async () => {
    const servers = [await backend("one", base + 1, seen), await backend("two", base + 2, seen)];
    stops.push(...servers.map((server) => () => new Promise<void>((r) => server.close(() => r()))));
    // The third instance never listens: its connections fail.
    haproxy = await startHaproxy({
      dir: join(dir, "lb"),
      port: base,
      backends: [
        { name: "one", port: base + 1 },
        { name: "two", port: base + 2 },
        { name: "gone", port: base + 3 },
      ],
    });
    stops.push(() => haproxy.stop());
    expect(readFileSync(join(dir, "lb", "haproxy.cfg"), "utf8")).toContain(`bind 127.0.0.1:${base}`);
    const answers = [];
    for (let i = 0; i < 12; i++) answers.push(await send(base, "GET", "/catalogue"));
    // Every request is answered, by the two live instances in turn, however the checks stand.
    expect(answers.every((answer) => answer.status === 200)).toBe(true);
    expect(new Set(answers.map((a) => a.instance))).toEqual(new Set(["one", "two"]));
    await haproxy.stop();
    expect(await haproxy.exited).not.toBe(127);
    await expect(send(base, "GET", "/catalogue")).rejects.toThrow(/ECONNREFUSED/);
  });

  it("sends a GET left unanswered to another instance, but never a POST", async () => {
    const seenHere: string[] = [];
    const servers = [await backend("dropper", base + 3, seenHere)];
    stops.push(() => new Promise<void>((r) => servers[0]!.close(() => r())));
    haproxy = await startHaproxy({
      dir: join(dir, "lb2"),
      port: base,
      backends: [
        { name: "dropper", port: base + 3 },
        { name: "one", port: base + 1 },
      ],
    });
    stops.push(() => haproxy.stop());
    seen.length = 0;
    const gets = [];
    for (let i = 0; i < 4; i++) gets.push(await send(base, "GET", "/drop"));
    expect(gets.map((g) => g.status)).toEqual([200, 200, 200, 200]);
    expect(gets.every((g) => g.instance === "one")).toBe(true);
    // The dropper saw some of them and said nothing; another instance answered each.
    expect(seenHere.filter((s) => s === "dropper GET").length).toBeGreaterThan(0);
    seenHere.length = 0;
    const posts = [];
    for (let i = 0; i < 4; i++) posts.push(await send(base, "POST", "/drop"));
    const dropped = seenHere.filter((s) => s === "dropper POST").length;
    expect(dropped).toBeGreaterThan(0);
    // Each POST the dropper saw was answered with an error, not sent again.
    expect(posts.filter((p) => p.status === 502).length).toBe(dropped);
    expect(seen.filter((s) => s === "one POST").length).toBe(4 - dropped);
  });
});

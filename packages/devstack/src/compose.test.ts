import { spawnSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import { repoRoot } from "./profile.ts";

/**
 * docker/compose.yaml cannot be started here (no Docker on this machine), so its structure and wiring
 * are checked instead: every service is an image or a build, every dependency, volume and host name
 * the app is given is a service of the file, the database pair is a GTID primary and a read-only
 * replica of it, the app's variables are ones the API reads, and HAProxy's own check accepts its config.
 */
interface Service {
  image?: string;
  build?: unknown;
  command?: string[] | string;
  environment?: Record<string, string | number>;
  depends_on?: Record<string, { condition: string }>;
  volumes?: string[];
  ports?: string[];
  deploy?: { replicas?: number };
}
const composeText = readFileSync(join(repoRoot, "docker/compose.yaml"), "utf8");
const compose = parse(composeText) as { services: Record<string, Service>; volumes?: Record<string, unknown> } & Record<string, unknown>;
const services = compose.services;
const app = services.app!;
const environment = app.environment ?? {};
const commandOf = (service: Service) => (Array.isArray(service.command) ? service.command : [service.command ?? ""]);

/** The environment variables the API reads (the keys of its zod schema in apps/api/src/config.ts). */
const apiVariables = new Set(
  [...readFileSync(join(repoRoot, "apps/api/src/config.ts"), "utf8").matchAll(/^ {2}([A-Z][A-Z0-9_]+): z\./gm)].map((match) => match[1]!),
);

describe("docker/compose.yaml", () => {
  it("has only the compose specification's top-level keys, and every service is an image or a build", () => {
    for (const key of Object.keys(compose))
      expect(["services", "volumes", "networks", "configs", "secrets", "name"].includes(key) || key.startsWith("x-")).toBe(true);
    for (const [name, service] of Object.entries(services)) expect(Boolean(service.image) !== Boolean(service.build), name).toBe(true);
  });

  it("waits only on services of the file, and mounts only declared volumes or files beside it", () => {
    for (const service of Object.values(services)) {
      for (const [dependency, { condition }] of Object.entries(service.depends_on ?? {})) {
        expect(services[dependency], dependency).toBeDefined();
        expect(["service_started", "service_healthy", "service_completed_successfully"]).toContain(condition);
        if (condition === "service_healthy") expect(services[dependency] as { healthcheck?: unknown }).toHaveProperty("healthcheck");
      }
      for (const volume of service.volumes ?? []) {
        const source = volume.split(":")[0]!;
        if (source.startsWith(".")) expect(existsSync(join(repoRoot, "docker", source)), source).toBe(true);
        else expect(compose.volumes, source).toHaveProperty(source);
      }
    }
  });

  it("runs several app replicas behind HAProxy, which alone publishes a port, after the migrations ran once", () => {
    expect(app.deploy?.replicas).toBeGreaterThan(1);
    expect(app.ports).toBeUndefined();
    const balancer = services["load-balancer"]!;
    expect(balancer.image).toMatch(/^haproxy:/);
    expect(balancer.ports).toEqual(["8080:8080"]);
    expect(balancer.volumes).toContain("./haproxy.cfg:/usr/local/etc/haproxy/haproxy.cfg:ro");
    // HAProxy finds the replicas by the app service's name, on the port the image listens on (Dockerfile: PORT=8080).
    expect(readFileSync(join(repoRoot, "docker/haproxy.cfg"), "utf8")).toMatch(
      /^\s+server-template app- \d+ app:8080 check resolvers docker/m,
    );
    expect(readFileSync(join(repoRoot, "docker/Dockerfile"), "utf8")).toMatch(/PORT=8080/);
    expect(app.depends_on?.migrate).toEqual({ condition: "service_completed_successfully" });
    expect(commandOf(services.migrate!).join(" ")).toContain("src/cli/migrate.ts");
    expect(commandOf(app).join(" ")).not.toContain("migrate");
  });

  it("points the app at services of the file, with variables the API reads", () => {
    for (const name of Object.keys(environment)) expect(apiVariables.has(name), name).toBe(true);
    expect(services[String(environment.DATABASE_HOST)]?.image).toMatch(/^mariadb:/);
    expect(services[String(environment.DATABASE_REPLICA_HOST)]?.image).toMatch(/^mariadb:/);
    expect(environment.DATABASE_REPLICA_HOST).not.toBe(environment.DATABASE_HOST);
    expect(services[new URL(String(environment.S3_ENDPOINT)).hostname]).toBeDefined();
    expect(services[String(environment.SMTP_HOST)]).toBeDefined();
  });

  it("has a GTID primary with a row-based binary log and a read-only replica following it", () => {
    const primary = services[String(environment.DATABASE_HOST)]!;
    const replica = services[String(environment.DATABASE_REPLICA_HOST)]!;
    expect(commandOf(primary)).toEqual(
      expect.arrayContaining(["--server-id=1", "--binlog-format=ROW", "--gtid-strict-mode=1", expect.stringMatching(/^--log-bin/)]),
    );
    expect(commandOf(replica)).toEqual(expect.arrayContaining(["--server-id=2", "--read-only=1", "--gtid-strict-mode=1"]));
    expect(replica.environment?.MARIADB_MASTER_HOST).toBe(environment.DATABASE_HOST);
    expect(replica.environment?.MARIADB_REPLICATION_USER).toBe(primary.environment?.MARIADB_REPLICATION_USER);
    expect(replica.environment?.MARIADB_REPLICATION_PASSWORD).toBe("${DATABASE_REPLICATION_PASSWORD}");
  });

  it("makes every secret it takes from the environment required (or gives it a default) where it is first needed", () => {
    const references = [...composeText.matchAll(/\$\{([A-Z_]+)(:[?-][^}]*)?\}/g)];
    for (const name of new Set(references.map((match) => match[1]!)))
      expect(
        references.some((match) => match[1] === name && match[2]),
        name,
      ).toBe(true);
  });
});

describe("docker/haproxy.cfg", () => {
  it("passes HAProxy's own configuration check", () => {
    const check = spawnSync("haproxy", ["-c", "-f", join(repoRoot, "docker/haproxy.cfg")], { encoding: "utf8" });
    expect(check.error).toBeUndefined();
    expect(`${check.stdout}${check.stderr}`).toMatch(/Configuration file is valid/);
    expect(check.status).toBe(0);
  });
});

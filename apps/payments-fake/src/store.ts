import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";

/** Objects the fake keeps, by id, in the provider's JSON shapes. */
export type ProviderObject = Record<string, unknown> & { id: string; object: string };

export interface FakeState {
  createdAt: string;
  objects: Record<string, ProviderObject>;
  /** Idempotency keys → the answer first given for them. */
  idempotency: Record<string, { status: number; body: unknown; requestPath: string }>;
  events: string[];
}

/** Ids in the provider's style: a prefix, then random letters and digits. */
export function newId(prefix: string): string {
  return `${prefix}_${randomBytes(12).toString("base64url").replace(/[-_]/g, "x")}`;
}

export const nowSeconds = () => Math.floor(Date.now() / 1000);

/**
 * The fake's own state in a small JSON file, written after every change (atomically: a temp file,
 * then a rename), so a restart loses nothing.
 */
export class Store {
  readonly state: FakeState;

  constructor(private readonly file: string) {
    if (existsSync(file)) {
      const loaded = JSON.parse(readFileSync(file, "utf8")) as Partial<FakeState>;
      this.state = {
        createdAt: loaded.createdAt ?? new Date().toISOString(),
        objects: loaded.objects ?? {},
        idempotency: loaded.idempotency ?? {},
        events: loaded.events ?? [],
      };
    } else {
      this.state = { createdAt: new Date().toISOString(), objects: {}, idempotency: {}, events: [] };
      this.save();
    }
  }

  save(): void {
    mkdirSync(dirname(this.file), { recursive: true });
    const temporary = `${this.file}.${process.pid}.tmp`;
    writeFileSync(temporary, JSON.stringify(this.state));
    renameSync(temporary, this.file);
  }

  get<T extends ProviderObject>(id: string, object?: string): T | undefined {
    const found = this.state.objects[id];
    if (!found || (object && found.object !== object)) return undefined;
    return found as T;
  }

  put<T extends ProviderObject>(value: T): T {
    this.state.objects[value.id] = value;
    this.save();
    return value;
  }

  all<T extends ProviderObject>(object: string): T[] {
    return Object.values(this.state.objects).filter((o) => o.object === object) as T[];
  }
}

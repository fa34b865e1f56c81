/**
 * Where drafts live on this device. The forms only see the DraftStorage interface: the app uses
 * IndexedDB (through idb), unit tests use the in-memory one. Values are structured-cloned, so a
 * draft may hold Blobs (photos taken while offline).
 */
import { openDB, type IDBPDatabase } from "idb";

export interface DraftStorage {
  get<T>(key: string): Promise<T | undefined>;
  put<T>(key: string, value: T): Promise<void>;
  delete(key: string): Promise<void>;
}

const DATABASE = "grainyard-drafts";
const STORE = "drafts";

/** IndexedDB storage; falls back to memory when the browser refuses IndexedDB (private mode). */
function createIndexedDbDraftStorage(): DraftStorage {
  let database: Promise<IDBPDatabase> | null = null;
  const fallback = createMemoryDraftStorage();
  let useFallback = typeof indexedDB === "undefined";

  function open(): Promise<IDBPDatabase> {
    database ??= openDB(DATABASE, 1, {
      upgrade(db) {
        if (!db.objectStoreNames.contains(STORE)) db.createObjectStore(STORE);
      },
    });
    return database;
  }

  async function attempt<T>(work: (db: IDBPDatabase) => Promise<T>, fallbackWork: () => Promise<T>): Promise<T> {
    if (useFallback) return fallbackWork();
    try {
      return await work(await open());
    } catch {
      useFallback = true;
      return fallbackWork();
    }
  }

  return {
    get: <T>(key: string) =>
      attempt(
        async (db) => (await db.get(STORE, key)) as T | undefined,
        () => fallback.get<T>(key),
      ),
    put: <T>(key: string, value: T) =>
      attempt(
        async (db) => void (await db.put(STORE, value, key)),
        () => fallback.put(key, value),
      ),
    delete: (key: string) =>
      attempt(
        (db) => db.delete(STORE, key),
        () => fallback.delete(key),
      ),
  };
}

/** Keeps drafts in memory only (tests, and browsers without IndexedDB). */
export function createMemoryDraftStorage(): DraftStorage & { readonly entries: Map<string, unknown> } {
  const entries = new Map<string, unknown>();
  return {
    entries,
    async get<T>(key: string) {
      return entries.get(key) as T | undefined;
    },
    async put<T>(key: string, value: T) {
      entries.set(key, value);
    },
    async delete(key: string) {
      entries.delete(key);
    },
  };
}

let shared: DraftStorage | null = null;

/** The app's one draft storage (IndexedDB). */
export function draftStorage(): DraftStorage {
  shared ??= createIndexedDbDraftStorage();
  return shared;
}

/** For tests: use another storage everywhere. */
export function useDraftStorage(storage: DraftStorage | null) {
  shared = storage;
}

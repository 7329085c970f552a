/*
 * Photos taken for an observation wait here until the observation is sent. IndexedDB keeps them
 * across a reload (Blobs are stored as they are); where it is missing or refuses (some private
 * modes), they are kept in this page's memory only, and `isDurable` is false so the screen can
 * say that a reload would lose them.
 */

export type KeptPhoto = { key: string; name: string; type: string; bytes: number };

export interface PhotoStore {
  /** True when kept photos survive a reload (IndexedDB). */
  readonly isDurable: boolean;
  keep(file: Blob & { name?: string }): Promise<KeptPhoto>;
  get(key: string): Promise<Blob | undefined>;
  remove(keys: readonly string[]): Promise<void>;
}

const DB_NAME = "benchwarden-photos";
const STORE = "photos";

function newKey(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("");
}

function describe(file: Blob & { name?: string }, key: string): KeptPhoto {
  return { key, name: file.name || "photo.jpg", type: file.type, bytes: file.size };
}

/** Photos in this page's memory only: lost on reload. */
export function createMemoryPhotoStore(): PhotoStore {
  const blobs = new Map<string, Blob>();
  return {
    isDurable: false,
    async keep(file) {
      const key = newKey();
      blobs.set(key, file);
      return describe(file, key);
    },
    async get(key) {
      return blobs.get(key);
    },
    async remove(keys) {
      for (const key of keys) blobs.delete(key);
    },
  };
}

function request<T>(req: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error("IndexedDB request failed"));
  });
}

function openDatabase(factory: IDBFactory): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = factory.open(DB_NAME, 1);
    req.onupgradeneeded = () => {
      if (!req.result.objectStoreNames.contains(STORE)) req.result.createObjectStore(STORE);
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error("IndexedDB could not be opened"));
    req.onblocked = () => reject(new Error("IndexedDB is blocked by another tab"));
  });
}

/** Photos in IndexedDB (they survive a reload). Rejects when IndexedDB cannot be opened. */
export async function openIndexedDbPhotoStore(factory: IDBFactory = indexedDB): Promise<PhotoStore> {
  const db = await openDatabase(factory);
  const tx = (mode: IDBTransactionMode) => db.transaction(STORE, mode).objectStore(STORE);
  return {
    isDurable: true,
    async keep(file) {
      const key = newKey();
      // Stored as a Blob of its own (not the File), which every engine can clone.
      await request(tx("readwrite").put({ blob: new Blob([file], { type: file.type }), name: file.name ?? "" }, key));
      return describe(file, key);
    },
    async get(key) {
      const row = (await request(tx("readonly").get(key))) as { blob?: Blob } | undefined;
      return row?.blob;
    },
    async remove(keys) {
      const store = tx("readwrite");
      await Promise.all(keys.map((key) => request(store.delete(key))));
    },
  };
}

/**
 * The photo store of this browser: IndexedDB when it opens, else memory. IndexedDB is opened on
 * first use; a photo it refuses (quota) is kept in memory rather than lost, and `isDurable` turns
 * false so the screen can say a reload would lose it.
 */
export function createPhotoStore(): PhotoStore {
  const hasIndexedDb = typeof indexedDB !== "undefined";
  const memory = createMemoryPhotoStore();
  let isDurable = hasIndexedDb;
  let opened: Promise<PhotoStore | null> | null = null;
  const durable = () =>
    (opened ??= hasIndexedDb
      ? openIndexedDbPhotoStore().catch(() => {
          isDurable = false;
          return null;
        })
      : Promise.resolve(null));
  return {
    get isDurable() {
      return isDurable;
    },
    async keep(file) {
      const store = await durable();
      if (store) {
        try {
          return await store.keep(file);
        } catch {
          isDurable = false;
        }
      }
      return memory.keep(file);
    },
    async get(key) {
      const inMemory = await memory.get(key);
      if (inMemory) return inMemory;
      const store = await durable();
      return store ? store.get(key) : undefined;
    },
    async remove(keys) {
      await memory.remove(keys);
      const store = await durable();
      if (store) await store.remove(keys);
    },
  };
}

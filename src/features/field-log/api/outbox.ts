/**
 * The field log's outbox: every entry is written to IndexedDB first, with its client-made id,
 * then sent. A dropped connection leaves it waiting; it is sent again when the browser says it
 * is online, and on a back-off timer. The server treats a repeated id as the same record, so
 * sending twice never makes two.
 */
import { type DBSchema, type IDBPDatabase, openDB } from 'idb';

export type OutboxState = 'waiting' | 'sending' | 'saved' | 'refused';
export type OutboxKind = 'harvest' | 'observation' | 'field-event' | 'stand-count';

export interface OutboxItem {
  id: string;
  trialSlug: string;
  kind: OutboxKind;
  method: 'POST' | 'PUT';
  url: string;
  body: unknown;
  /** what the grower sees in the queue, e.g. "Plot 104 · harvest 12 fruit, 180 g" */
  label: string;
  state: OutboxState;
  message: string | null;
  attempts: number;
  nextTryAt: number;
  createdAt: number;
  savedAt: number | null;
}

interface OutboxDb extends DBSchema {
  outbox: { key: string; value: OutboxItem; indexes: { 'by-trial': string } };
}

const DB_NAME = 'rowtally-field-log';
/** Saved entries stay listed for a day so a grower can see the round went through. */
const KEEP_SAVED_MS = 24 * 60 * 60 * 1000;
const MAX_BACKOFF_MS = 60_000;

/** Retry delay after `attempts` failures: 1 s, 2 s, 4 s … up to a minute. */
export const backoffMs = (attempts: number) =>
  Math.min(MAX_BACKOFF_MS, 1000 * 2 ** Math.max(0, attempts - 1));

/** Statuses worth asking again: signed out, timeouts, rate limits and server trouble. */
const retryable = (status: number) =>
  status === 401 || status === 408 || status === 429 || status >= 500;

export class Outbox {
  private db: Promise<IDBPDatabase<OutboxDb>>;
  private listeners = new Set<() => void>();
  private flushing: Promise<void> | null = null;
  private again = false;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private onSaved = new Set<(item: OutboxItem) => void>();

  constructor(
    private readonly send: typeof fetch = (...args) => fetch(...args),
    name = DB_NAME,
  ) {
    this.db = openDB<OutboxDb>(name, 1, {
      upgrade(db) {
        const store = db.createObjectStore('outbox', { keyPath: 'id' });
        store.createIndex('by-trial', 'trialSlug');
      },
    });
  }

  subscribe(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  whenSaved(listener: (item: OutboxItem) => void): () => void {
    this.onSaved.add(listener);
    return () => this.onSaved.delete(listener);
  }

  private emit() {
    for (const l of this.listeners) l();
  }

  async list(trialSlug: string): Promise<OutboxItem[]> {
    const items = await (await this.db).getAllFromIndex('outbox', 'by-trial', trialSlug);
    return items.sort((a, b) => b.createdAt - a.createdAt);
  }

  /** Keeps the entry on the device first; only then tries to send it. */
  async add(
    items: Pick<OutboxItem, 'id' | 'trialSlug' | 'kind' | 'method' | 'url' | 'body' | 'label'>[],
  ): Promise<void> {
    const db = await this.db;
    const tx = db.transaction('outbox', 'readwrite');
    const now = Date.now();
    for (const item of items)
      await tx.store.put({
        ...item,
        state: 'waiting',
        message: null,
        attempts: 0,
        nextTryAt: now,
        createdAt: now,
        savedAt: null,
      });
    await tx.done;
    this.emit();
    void this.flush();
  }

  /** Sends now whatever is waiting (the online event and the "send now" button call this). */
  async retryNow(): Promise<void> {
    const db = await this.db;
    const tx = db.transaction('outbox', 'readwrite');
    for (const item of await tx.store.getAll())
      if (item.state === 'waiting') await tx.store.put({ ...item, nextTryAt: Date.now() });
    await tx.done;
    return this.flush();
  }

  async discard(id: string): Promise<void> {
    await (await this.db).delete('outbox', id);
    this.emit();
  }

  flush(): Promise<void> {
    if (this.flushing) {
      this.again = true;
      return this.flushing;
    }
    this.flushing = this.run().finally(() => {
      this.flushing = null;
      if (this.again) {
        this.again = false;
        void this.flush();
      }
    });
    return this.flushing;
  }

  private async put(item: OutboxItem) {
    await (await this.db).put('outbox', item);
    this.emit();
  }

  private async run(): Promise<void> {
    const db = await this.db;
    const all = await db.getAll('outbox');
    const now = Date.now();
    for (const old of all)
      if (old.state === 'saved' && old.savedAt !== null && now - old.savedAt > KEEP_SAVED_MS)
        await db.delete('outbox', old.id);
    // An entry left "sending" by a closed tab is simply waiting again.
    const due = all
      .filter((i) => (i.state === 'waiting' || i.state === 'sending') && i.nextTryAt <= now)
      .sort((a, b) => a.createdAt - b.createdAt);
    for (const item of due) {
      const ok = await this.sendOne(item);
      if (!ok) break; // the connection is down: the rest would fail the same way
    }
    this.schedule();
  }

  private async sendOne(item: OutboxItem): Promise<boolean> {
    await this.put({ ...item, state: 'sending', attempts: item.attempts + 1 });
    let response: Response;
    try {
      response = await this.send(item.url, {
        method: item.method,
        credentials: 'same-origin',
        headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
        body: JSON.stringify(item.body),
      });
    } catch {
      await this.put({
        ...item,
        state: 'waiting',
        attempts: item.attempts + 1,
        nextTryAt: Date.now() + backoffMs(item.attempts + 1),
        message: 'No connection; kept on this device and sent when the signal returns.',
      });
      return false;
    }
    if (response.ok) {
      const saved = {
        ...item,
        state: 'saved' as const,
        message: null,
        savedAt: Date.now(),
        attempts: item.attempts + 1,
      };
      await this.put(saved);
      for (const l of this.onSaved) l(saved);
      return true;
    }
    const payload = (await response.json().catch(() => null)) as {
      error?: { message?: string; details?: { fields?: { message: string }[] } };
    } | null;
    const message =
      payload?.error?.details?.fields?.map((f) => f.message).join(' ') ||
      payload?.error?.message ||
      `The server answered ${response.status}.`;
    if (retryable(response.status)) {
      await this.put({
        ...item,
        state: 'waiting',
        attempts: item.attempts + 1,
        nextTryAt: Date.now() + backoffMs(item.attempts + 1),
        message:
          response.status === 401 ? 'Signed out: sign in again and it will be sent.' : message,
      });
      return false;
    }
    await this.put({ ...item, state: 'refused', attempts: item.attempts + 1, message });
    return true;
  }

  private async schedule() {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const waiting = (await (await this.db).getAll('outbox')).filter((i) => i.state === 'waiting');
    if (waiting.length === 0) return;
    const next = Math.min(...waiting.map((i) => i.nextTryAt));
    this.timer = setTimeout(() => void this.flush(), Math.max(250, next - Date.now()));
  }

  close() {
    if (this.timer) clearTimeout(this.timer);
    this.listeners.clear();
    this.onSaved.clear();
  }
}

let shared: Outbox | null = null;
/** One outbox per tab, listening for the connection to return. */
export function sharedOutbox(): Outbox {
  if (!shared) {
    shared = new Outbox();
    window.addEventListener('online', () => void shared?.retryNow());
    void shared.flush();
  }
  return shared;
}

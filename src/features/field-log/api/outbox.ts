/**
 * The field log's outbox: every entry is written to IndexedDB first, with its client-made id,
 * then sent. A dropped connection leaves it waiting; it is sent again when the browser says it
 * is online, and on a back-off timer. The server treats a repeated id as the same record, so
 * sending twice never makes two.
 *
 * Each entry remembers the account that queued it and is sent only while that account is the
 * one signed in (a phone shared by two growers): before sending, the outbox asks the server
 * whose session this is. Photos wait in the same queue, their file kept as a Blob, and go up
 * as multipart with upload progress. Every request goes through the app's API client, so an
 * answer is read, and a refusal explained, exactly as everywhere else.
 */
import { sessionSchema } from '@common/contracts/me';
import { type DBSchema, type IDBPDatabase, openDB } from 'idb';
import { z } from 'zod';
import {
  ApiError,
  apiUpload,
  createApiClient,
  type FetchLike,
  multipartBody,
} from '@/lib/api-client';

export type OutboxState = 'waiting' | 'sending' | 'saved' | 'refused';
export type OutboxKind = 'harvest' | 'observation' | 'field-event' | 'stand-count' | 'photo';

export interface OutboxItem {
  id: string;
  trialSlug: string;
  kind: OutboxKind;
  method: 'POST' | 'PUT';
  url: string;
  /** JSON body; for a photo, its multipart text fields */
  body: unknown;
  /** a photo's file, sent as the multipart field `photo` */
  file?: Blob;
  fileName?: string;
  /** what the grower sees in the queue, e.g. "Plot 104 · harvest 12 fruit, 180 g" */
  label: string;
  /** the account that queued it; it is sent only under that account's session */
  accountId: string;
  accountName: string;
  state: OutboxState;
  message: string | null;
  attempts: number;
  nextTryAt: number;
  createdAt: number;
  savedAt: number | null;
  /** share of a photo's bytes sent so far (0–1), while it is being sent */
  progress?: number;
}

export type NewOutboxItem = Pick<
  OutboxItem,
  'id' | 'trialSlug' | 'kind' | 'method' | 'url' | 'body' | 'label' | 'file' | 'fileName'
>;
export interface OutboxAccount {
  id: string;
  name: string;
}

/** Sends a multipart form with upload progress, read as `api` reads answers (`apiUpload`). */
export type Upload = typeof apiUpload;

interface OutboxDb extends DBSchema {
  outbox: { key: string; value: OutboxItem; indexes: { 'by-trial': string } };
}

const DB_NAME = 'rowtally-field-log';
/** Saved entries stay listed for a day so a grower can see the round went through. */
const KEEP_SAVED_MS = 24 * 60 * 60 * 1000;
const MAX_BACKOFF_MS = 60_000;
const NO_CONNECTION = 'No connection; kept on this device and sent when the signal returns.';
const SIGNED_OUT = 'Signed out: sign in again and it will be sent.';
const otherAccount = (name: string) =>
  `Queued by ${name}: kept on this device until ${name} signs in again.`;

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
  private progress = new Map<string, number>();
  private readonly api: ReturnType<typeof createApiClient>;

  constructor(
    send?: FetchLike,
    name = DB_NAME,
    private readonly upload: Upload = apiUpload,
  ) {
    this.api = createApiClient(send);
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
    return items
      .map((i) => (this.progress.has(i.id) ? { ...i, progress: this.progress.get(i.id)! } : i))
      .sort((a, b) => b.createdAt - a.createdAt);
  }

  /** Keeps the entry on the device first, under the account queuing it; then tries to send. */
  async add(items: NewOutboxItem[], account: OutboxAccount): Promise<void> {
    const db = await this.db;
    const tx = db.transaction('outbox', 'readwrite');
    const now = Date.now();
    for (const item of items)
      await tx.store.put({
        ...item,
        accountId: account.id,
        accountName: account.name,
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

  /** Sends now whatever is waiting (the online event, sign-in and "send now" call this). */
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
    const { progress: _, ...stored } = item;
    await (await this.db).put('outbox', stored);
    this.emit();
  }

  /** Leaves an entry waiting, to be tried again after its back-off. */
  private wait(item: OutboxItem, message: string) {
    return this.put({
      ...item,
      state: 'waiting',
      attempts: item.attempts + 1,
      nextTryAt: Date.now() + backoffMs(item.attempts + 1),
      message,
    });
  }

  /** Whose session the browser holds now: an account, null when signed out, or no answer. */
  private async signedIn(): Promise<OutboxAccount | null | 'no-answer'> {
    try {
      return (await this.api('/api/session', sessionSchema)).user;
    } catch {
      return 'no-answer';
    }
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
    if (due.length) {
      const account = await this.signedIn();
      for (const item of due) {
        if (account === 'no-answer') await this.wait(item, NO_CONNECTION);
        else if (account === null) await this.wait(item, SIGNED_OUT);
        // (Entries kept before accounts were recorded with them go under whoever is signed in.)
        else if (item.accountId && item.accountId !== account.id)
          await this.wait(item, otherAccount(item.accountName));
        else if (!(await this.sendOne(item))) break; // the connection is down: the rest would fail the same way
      }
    }
    this.schedule();
  }

  private request(item: OutboxItem): Promise<unknown> {
    if (item.kind === 'photo' && item.file) {
      // The queue's id is the upload's id: a resend after a lost answer is the same upload.
      const fields = { uploadId: item.id, ...(item.body as Record<string, unknown>) };
      return this.upload(item.url, z.unknown(), {
        body: multipartBody(fields, {
          field: 'photo',
          blob: item.file,
          name: item.fileName ?? 'photo.jpg',
        }),
        method: item.method,
        onProgress: ({ loaded, total }) => {
          if (total <= 0) return;
          this.progress.set(item.id, loaded / total);
          this.emit();
        },
      });
    }
    return this.api(item.url, null, { method: item.method, body: item.body });
  }

  /** Sends one entry; false when the connection is down, so the rest of the round waits too. */
  private async sendOne(item: OutboxItem): Promise<boolean> {
    await this.put({ ...item, state: 'sending', attempts: item.attempts + 1 });
    try {
      await this.request(item);
    } catch (err) {
      this.progress.delete(item.id);
      const refusal = err instanceof ApiError ? err : null;
      if (refusal === null) {
        // Not an answer at all (say, a photo's file the browser no longer holds): sending it
        // again would fail the same way.
        const why = err instanceof Error ? err.message : String(err);
        await this.put({
          ...item,
          state: 'refused',
          attempts: item.attempts + 1,
          message: `Could not be sent from this device: ${why}`,
        });
        return true;
      }
      if (refusal.status === 0) {
        await this.wait(item, NO_CONNECTION);
        return false;
      }
      if (retryable(refusal.status)) {
        await this.wait(item, refusal.status === 401 ? SIGNED_OUT : refusal.summary);
        return false;
      }
      await this.put({
        ...item,
        state: 'refused',
        attempts: item.attempts + 1,
        message: refusal.summary,
      });
      return true;
    }
    this.progress.delete(item.id);
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

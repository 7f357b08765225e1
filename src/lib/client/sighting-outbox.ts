// Sightings saved on the device (IndexedDB, photos as Blobs) until the server has them. Each keeps
// its client UUID, so sending it again after a lost answer finds the first one on the server.
import { openDB, type DBSchema, type IDBPDatabase } from 'idb';
import type { FieldErrors } from './api';
import { sightingsApi, type PhotoFile } from './sightings-api';
import type { SightingInputJson } from '../schemas/sightings';

export interface OutboxEntry {
  clientUuid: string;
  sighting: SightingInputJson;
  photos: PhotoFile[];
  savedAt: string;
  /** waiting: will be sent when there is a connection; refused: the server said no (see error). */
  state: 'waiting' | 'refused';
  error?: string;
  fields?: FieldErrors;
}

interface OutboxDb extends DBSchema {
  sightings: { key: string; value: OutboxEntry };
}

const CHANGED = 'bearline-outbox-changed';
let dbPromise: Promise<IDBPDatabase<OutboxDb>> | null = null;

function db(): Promise<IDBPDatabase<OutboxDb>> {
  dbPromise ??= openDB<OutboxDb>('bearline-outbox', 1, {
    upgrade(d) {
      d.createObjectStore('sightings', { keyPath: 'clientUuid' });
    },
  });
  return dbPromise;
}

function announce() {
  window.dispatchEvent(new Event(CHANGED));
}

/** Calls `fn` whenever the outbox changes in this page; returns the unsubscribe. */
export function onOutboxChange(fn: () => void): () => void {
  window.addEventListener(CHANGED, fn);
  return () => window.removeEventListener(CHANGED, fn);
}

export async function saveToOutbox(entry: OutboxEntry): Promise<void> {
  await (await db()).put('sightings', entry);
  announce();
}

export async function listOutbox(): Promise<OutboxEntry[]> {
  const all = await (await db()).getAll('sightings');
  return all.sort((a, b) => a.savedAt.localeCompare(b.savedAt));
}

export async function removeFromOutbox(clientUuid: string): Promise<void> {
  await (await db()).delete('sightings', clientUuid);
  announce();
}

export type SendResult =
  { clientUuid: string; outcome: 'sent'; id: string } | { clientUuid: string; outcome: 'offline' | 'refused' | 'later'; message: string };

let flushing: Promise<SendResult[]> | null = null;

/** Sends every waiting sighting, oldest first; stops at the first sign of no connection. One run at a time. */
export function flushOutbox(): Promise<SendResult[]> {
  flushing ??= (async () => {
    const results: SendResult[] = [];
    try {
      for (const entry of await listOutbox()) {
        if (entry.state !== 'waiting') continue;
        const result = await sendOne(entry);
        results.push(result);
        if (result.outcome === 'offline') break;
      }
    } finally {
      flushing = null;
    }
    return results;
  })();
  return flushing;
}

async function sendOne(entry: OutboxEntry): Promise<SendResult> {
  try {
    const res = await sightingsApi.send(entry.sighting, entry.photos);
    await removeFromOutbox(entry.clientUuid);
    return { clientUuid: entry.clientUuid, outcome: 'sent', id: res.id };
  } catch (err) {
    const e = err as { status?: number; message?: string; fields?: FieldErrors };
    const status = e.status ?? 0;
    const message = e.message ?? 'Sending failed';
    if (status === 0) return { clientUuid: entry.clientUuid, outcome: 'offline', message };
    // Signed out, throttled or a server fault: try again later. Anything else the server refused.
    if (status === 401 || status === 408 || status === 429 || status >= 500) return { clientUuid: entry.clientUuid, outcome: 'later', message };
    await saveToOutbox({ ...entry, state: 'refused', error: message, fields: e.fields });
    return { clientUuid: entry.clientUuid, outcome: 'refused', message };
  }
}

/** Sends waiting sightings now, whenever the connection returns, and every minute while the page is open. */
export function keepFlushing(): () => void {
  const run = () => {
    if (navigator.onLine) flushOutbox().catch(() => undefined);
  };
  run();
  window.addEventListener('online', run);
  const timer = window.setInterval(run, 60_000);
  return () => {
    window.removeEventListener('online', run);
    window.clearInterval(timer);
  };
}

// What this device keeps for poor signal, in localStorage: build sheet drafts until they are saved,
// and the last answer seen for a few things worth opening with no signal (the sheet being edited, a
// builder's own cage records, public verification answers, the rulebook editions the live pre-check
// and the class list read, who was signed in). Everything but the public answers and the published
// editions (the same document for every reader) is keyed by user id and forgotten at sign-out,
// because laptops at the track are shared. Why localStorage and not IndexedDB: docs/decisions/0018-kept-on-this-device.md.
const PREFIX = 'cagewright.kept.';

/** What is kept: drafts and last-seen answers per user; verification answers are public. */
export type KeptKind = 'draft' | 'sheet' | 'record' | 'verify' | 'edition';

export interface Kept<T> {
  /** When it was kept (ms since the epoch). */
  at: number;
  value: T;
}

function storage(): Storage | null {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    return null; // storage blocked (private mode, policy): nothing is kept, nothing breaks
  }
}

export function keptKey(kind: KeptKind, userId: string | null, id: string): string {
  return `${PREFIX}${kind}.${userId ?? 'public'}.${id}`;
}

/** Keeps a value; false when the browser refused (storage full or blocked). */
export function keep<T>(kind: KeptKind, userId: string | null, id: string, value: T, at = Date.now()): boolean {
  try {
    storage()?.setItem(keptKey(kind, userId, id), JSON.stringify({ at, value } satisfies Kept<T>));
    return storage() !== null;
  } catch {
    return false;
  }
}

export function recall<T>(kind: KeptKind, userId: string | null, id: string): Kept<T> | null {
  try {
    const text = storage()?.getItem(keptKey(kind, userId, id));
    if (!text) return null;
    const parsed = JSON.parse(text) as Partial<Kept<T>>;
    return typeof parsed.at === 'number' && parsed.value !== undefined ? (parsed as Kept<T>) : null;
  } catch {
    return null; // unreadable: as if nothing were kept
  }
}

export function forget(kind: KeptKind, userId: string | null, id: string): void {
  try {
    storage()?.removeItem(keptKey(kind, userId, id));
  } catch {
    // nothing to do
  }
}

/**
 * Keeps at most `max` entries of a kind for this reader: the ones kept longest ago go first (a
 * rulebook edition is tens of kilobytes, and localStorage holds a few megabytes in all).
 */
export function keepNewest(kind: KeptKind, userId: string | null, max: number): void {
  const s = storage();
  if (!s) return;
  const prefix = keptKey(kind, userId, '');
  try {
    const entries = Array.from({ length: s.length }, (_, i) => s.key(i))
      .filter((k): k is string => k !== null && k.startsWith(prefix))
      .map((key) => ({ key, at: recall(kind, userId, key.slice(prefix.length))?.at ?? 0 }))
      .sort((a, b) => b.at - a.at);
    for (const { key } of entries.slice(max)) s.removeItem(key);
  } catch {
    // nothing to do
  }
}

/** Forgets everything kept for this user (sign-out), of every kind. */
export function forgetUser(userId: string): void {
  const s = storage();
  if (!s) return;
  const mine = (key: string) => key.startsWith(PREFIX) && key.slice(PREFIX.length).split('.')[1] === userId;
  try {
    const keys = Array.from({ length: s.length }, (_, i) => s.key(i)).filter((k): k is string => k !== null && mine(k));
    for (const key of keys) s.removeItem(key);
  } catch {
    // nothing to do
  }
}

const SESSION_KEY = `${PREFIX}session`;

/** Who was signed in on this device, so a page opened with no signal knows whose drafts to offer. */
export function keepSession<T>(payload: T): void {
  try {
    storage()?.setItem(SESSION_KEY, JSON.stringify({ at: Date.now(), value: payload }));
  } catch {
    // not kept; offline the app then shows sign-in as before
  }
}

export function recallSession<T>(): Kept<T> | null {
  try {
    const text = storage()?.getItem(SESSION_KEY);
    return text ? (JSON.parse(text) as Kept<T>) : null;
  } catch {
    return null;
  }
}

export function forgetSession(): void {
  try {
    storage()?.removeItem(SESSION_KEY);
  } catch {
    // nothing to do
  }
}

// Autosave for a ruleset draft: every change is saved after a short pause, one save at a time, with
// the lock version the server gave last. When someone else saved in between the server answers 409
// with its own document; both versions are then kept here until the admin chooses one, and nothing
// is saved over the other person's work without that choice.
import { onBeforeUnmount, ref, watch, type Ref } from 'vue';
import { isApiError, errorMessage } from '@/api/errors';
import type { DocumentProblem } from '@contracts/ruleset';

export type SaveState = 'saved' | 'pending' | 'saving' | 'conflict' | 'error';

export interface DraftConflict<T> {
  mine: T;
  theirs: T;
  theirsLockVersion: number;
  theirsUpdatedAt: string | null;
}

export interface AutosaveOptions<T> {
  document: Ref<T>;
  lockVersion: Ref<number>;
  save: (document: T, lockVersion: number) => Promise<{ lockVersion: number; problems: DocumentProblem[] }>;
  /** Pause after the last change before saving. */
  delayMs?: number;
  /** While true, changes are not saved (a published version, or before the draft has loaded). */
  paused?: Ref<boolean>;
}

const snapshot = (value: unknown): string => JSON.stringify(value);

export function useRulebookAutosave<T>(options: AutosaveOptions<T>) {
  const delayMs = options.delayMs ?? 800;
  const state = ref<SaveState>('saved');
  const problems = ref<DocumentProblem[]>([]);
  const conflict = ref<DraftConflict<T> | null>(null) as Ref<DraftConflict<T> | null>;
  const error = ref<string | null>(null);
  let saved = snapshot(options.document.value);
  let timer: ReturnType<typeof setTimeout> | null = null;
  let inFlight: Promise<void> | null = null;

  function clearTimer(): void {
    if (timer) clearTimeout(timer);
    timer = null;
  }

  async function saveNow(): Promise<void> {
    clearTimer();
    if (inFlight) {
      await inFlight;
      if (state.value === 'conflict') return;
    }
    const text = snapshot(options.document.value);
    if (text === saved && state.value !== 'error') {
      if (state.value === 'pending') state.value = 'saved';
      return;
    }
    state.value = 'saving';
    const copy = JSON.parse(text) as T;
    inFlight = (async () => {
      try {
        const answer = await options.save(copy, options.lockVersion.value);
        options.lockVersion.value = answer.lockVersion;
        problems.value = answer.problems;
        saved = text;
        error.value = null;
        // Changes made while the save was on the wire go in the next one.
        state.value = snapshot(options.document.value) === saved ? 'saved' : 'pending';
      } catch (err) {
        if (isApiError(err, 'conflict') && typeof (err.details as { currentLockVersion?: unknown })?.currentLockVersion === 'number') {
          const d = err.details as { currentLockVersion: number; currentDocument: T; currentUpdatedAt?: string };
          conflict.value = { mine: copy, theirs: d.currentDocument, theirsLockVersion: d.currentLockVersion, theirsUpdatedAt: d.currentUpdatedAt ?? null };
          state.value = 'conflict';
        } else {
          error.value = errorMessage(err);
          state.value = 'error';
        }
      } finally {
        inFlight = null;
      }
    })();
    await inFlight;
    // The save above may have moved the state on (TypeScript cannot see that through the await).
    if ((state.value as SaveState) === 'pending') schedule();
  }

  function schedule(): void {
    clearTimer();
    timer = setTimeout(() => void saveNow(), delayMs);
  }

  watch(
    options.document,
    (doc) => {
      if (options.paused?.value || state.value === 'conflict') return;
      if (snapshot(doc) === saved) return;
      state.value = 'pending';
      schedule();
    },
    { deep: true },
  );

  /** A freshly loaded document: the new baseline, nothing to save. */
  function reset(document: T, lockVersion: number): void {
    clearTimer();
    saved = snapshot(document);
    options.document.value = document;
    options.lockVersion.value = lockVersion;
    conflict.value = null;
    state.value = 'saved';
  }

  /** Keep this browser's version: save it over the other one, now knowingly. */
  async function keepMine(): Promise<void> {
    const c = conflict.value;
    if (!c) return;
    conflict.value = null;
    options.lockVersion.value = c.theirsLockVersion;
    options.document.value = c.mine;
    saved = snapshot(c.theirs);
    state.value = 'pending';
    await saveNow();
  }

  /** Take the version saved by the other person; this browser's changes are dropped. */
  function keepTheirs(): void {
    const c = conflict.value;
    if (!c) return;
    reset(c.theirs, c.theirsLockVersion);
  }

  onBeforeUnmount(() => {
    // Leaving the page saves what is pending rather than dropping it.
    if (timer) void saveNow();
  });

  return { state, problems, conflict, error, saveNow, reset, keepMine, keepTheirs };
}

// Draft autosave: debounced saves with the last lock version, one at a time; a 409 keeps both
// versions until the admin chooses; "keep mine" saves over theirs knowingly, "keep theirs" drops mine.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { ApiError } from '@/api/errors';
import { useRulebookAutosave } from '@/composables/useRulebookAutosave';

interface Doc {
  edition: string;
  wall: number;
}

beforeEach(() => vi.useFakeTimers());
afterEach(() => vi.useRealTimers());

function setup(save: (doc: Doc, lock: number) => Promise<{ lockVersion: number; problems: { path: string; message: string }[] }>) {
  const document = ref<Doc>({ edition: '2028', wall: 0.095 });
  const lockVersion = ref(3);
  const scope = effectScope();
  const autosave = scope.run(() => useRulebookAutosave({ document, lockVersion, save, delayMs: 500 }))!;
  return { document, lockVersion, autosave, scope };
}

const settle = async () => {
  await vi.runAllTimersAsync();
  await nextTick();
};

describe('useRulebookAutosave', () => {
  it('saves once after a pause, with the lock version, and takes the new one', async () => {
    const save = vi.fn(async (_doc: Doc, lock: number) => ({ lockVersion: lock + 1, problems: [{ path: 'requirements.0.section', message: 'Required' }] }));
    const { document, lockVersion, autosave } = setup(save);
    document.value.wall = 0.1;
    await nextTick();
    document.value.wall = 0.12;
    await nextTick();
    expect(autosave.state.value).toBe('pending');
    await vi.advanceTimersByTimeAsync(499);
    expect(save).not.toHaveBeenCalled();
    await settle();
    expect(save).toHaveBeenCalledTimes(1);
    expect(save).toHaveBeenCalledWith({ edition: '2028', wall: 0.12 }, 3);
    expect(lockVersion.value).toBe(4);
    expect(autosave.state.value).toBe('saved');
    expect(autosave.problems.value).toEqual([{ path: 'requirements.0.section', message: 'Required' }]);
  });

  it('on a 409 keeps both versions and saves nothing more until the admin chooses; keep mine saves over theirs', async () => {
    const theirs = { edition: '2028', wall: 0.134 };
    const save = vi
      .fn<(doc: Doc, lock: number) => Promise<{ lockVersion: number; problems: [] }>>()
      .mockRejectedValueOnce(new ApiError(409, 'conflict', 'Someone else saved this draft', { currentLockVersion: 7, currentDocument: theirs, currentUpdatedAt: '2026-12-01T10:00:00.000Z' }))
      .mockResolvedValueOnce({ lockVersion: 8, problems: [] });
    const { document, lockVersion, autosave } = setup(save);
    document.value.wall = 0.12;
    await settle();
    expect(autosave.state.value).toBe('conflict');
    expect(autosave.conflict.value).toEqual({ mine: { edition: '2028', wall: 0.12 }, theirs, theirsLockVersion: 7, theirsUpdatedAt: '2026-12-01T10:00:00.000Z' });
    // Further edits wait for the choice.
    document.value.edition = '2028a';
    await settle();
    expect(save).toHaveBeenCalledTimes(1);

    await autosave.keepMine();
    await settle();
    expect(save).toHaveBeenLastCalledWith({ edition: '2028', wall: 0.12 }, 7);
    expect(lockVersion.value).toBe(8);
    expect(autosave.state.value).toBe('saved');
    expect(autosave.conflict.value).toBeNull();
  });

  it('keep theirs replaces this browser\'s document and lock version without saving', async () => {
    const theirs = { edition: '2028', wall: 0.134 };
    const save = vi.fn().mockRejectedValueOnce(new ApiError(409, 'conflict', 'x', { currentLockVersion: 9, currentDocument: theirs }));
    const { document, lockVersion, autosave } = setup(save);
    document.value.wall = 0.12;
    await settle();
    autosave.keepTheirs();
    await settle();
    expect(document.value).toEqual(theirs);
    expect(lockVersion.value).toBe(9);
    expect(autosave.state.value).toBe('saved');
    expect(save).toHaveBeenCalledTimes(1);
  });

  it('reports other failures and tries again on the next change', async () => {
    const save = vi.fn().mockRejectedValueOnce(new ApiError(0, 'network_error', 'Cannot reach the server.')).mockResolvedValueOnce({ lockVersion: 4, problems: [] });
    const { document, autosave } = setup(save);
    document.value.wall = 0.12;
    await settle();
    expect(autosave.state.value).toBe('error');
    expect(autosave.error.value).toBe('Cannot reach the server.');
    document.value.wall = 0.125;
    await settle();
    expect(save).toHaveBeenLastCalledWith({ edition: '2028', wall: 0.125 }, 3);
    expect(autosave.state.value).toBe('saved');
  });
});

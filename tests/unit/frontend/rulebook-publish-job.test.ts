// The publish dialog's job: an interrupted re-check keeps being followed until it completes; one that
// finally failed shows its reason, and "run again" asks the server to retry it and follows it anew.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, ref } from 'vue';
import type { JobProgressWire } from '@/api/rulebook-admin';

const api = vi.hoisted(() => ({
  publishDraft: vi.fn(),
  jobProgress: vi.fn(),
  retryJob: vi.fn(),
}));
vi.mock('@/api/rulebook-admin', () => api);

const { useRulebookPublish } = await import('@/composables/useRulebookPublish');

function job(state: JobProgressWire['state'], done: number, error: string | null = null): JobProgressWire {
  return { id: 'j0000000-0000-4000-8000-000000000001', queue: 'ruleset.republish', state, total: 10, done, failed: 0, error, attempts: 1, createdAt: '', updatedAt: '', finishedAt: null, result: null };
}

beforeEach(() => vi.useFakeTimers());
afterEach(() => {
  vi.useRealTimers();
  vi.clearAllMocks();
});

function setup() {
  const scope = effectScope();
  return scope.run(() => useRulebookPublish(ref('v1'), ref(3), { pollMs: 1000 }))!;
}

describe('useRulebookPublish', () => {
  it('keeps following a re-check that was interrupted and goes on by itself', async () => {
    api.publishDraft.mockResolvedValue({ versionId: 'v1', jobId: 'j1', classIds: ['club-saloon'] });
    api.jobProgress
      .mockResolvedValueOnce(job('running', 4))
      .mockResolvedValueOnce(job('retrying', 4, 'The server running this job stopped before it finished.'))
      .mockResolvedValueOnce(job('completed', 10));
    const pub = setup();
    await pub.publish('2028-01-01');
    expect(pub.job.value?.state).toBe('running');
    await vi.advanceTimersByTimeAsync(1000);
    expect(pub.job.value?.state).toBe('retrying');
    await vi.advanceTimersByTimeAsync(1000);
    expect(pub.job.value?.state).toBe('completed');
    await vi.advanceTimersByTimeAsync(5000);
    expect(api.jobProgress).toHaveBeenCalledTimes(3);
  });

  it('runs a finally failed re-check again and follows it to the end', async () => {
    api.publishDraft.mockResolvedValue({ versionId: 'v1', jobId: 'j1', classIds: ['club-saloon'] });
    api.jobProgress.mockResolvedValueOnce(job('failed', 4, 'The published version could not be read. (tried 5 times)'));
    const pub = setup();
    await pub.publish('2028-01-01');
    expect(pub.job.value).toMatchObject({ state: 'failed', error: 'The published version could not be read. (tried 5 times)' });
    api.retryJob.mockResolvedValue(job('queued', 4));
    api.jobProgress.mockResolvedValueOnce(job('running', 6)).mockResolvedValueOnce(job('completed', 10));
    await pub.rerun();
    expect(api.retryJob).toHaveBeenCalledWith('j0000000-0000-4000-8000-000000000001');
    expect(pub.job.value?.state).toBe('running');
    await vi.advanceTimersByTimeAsync(1000);
    expect(pub.job.value).toMatchObject({ state: 'completed', done: 10 });
    expect(pub.publishError.value).toBeNull();
  });
});

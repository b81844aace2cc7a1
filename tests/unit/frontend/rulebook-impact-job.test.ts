// The impact preview as a background job: the composable starts it and follows it to its result, shows
// a job's failure reason and a refused start; the panel shows how far the job has got while it runs, the
// summary once it is done, and says when the draft changed after it was worked out.
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, ref } from 'vue';
import type { ImpactWire, JobProgressWire } from '@/api/rulebook-admin';
import RulebookImpactPanel from '@/components/rulebook/RulebookImpactPanel.vue';

const api = vi.hoisted(() => ({ startImpact: vi.fn(), jobProgress: vi.fn() }));
vi.mock('@/api/rulebook-admin', () => api);
const { ApiError } = await import('@/api/errors');

const { useRulebookImpact } = await import('@/composables/useRulebookImpact');
const global = { plugins: [[PrimeVue, { theme: 'none' }]] as [typeof PrimeVue, object][] };

const impact: ImpactWire = {
  versionId: 'v1',
  lockVersion: 3,
  classIds: ['club-saloon'],
  checked: 2540,
  failed: 0,
  counts: { passToFail: 1, failToPass: 0, unchanged: 2539, needsInformationChanged: 0, otherChanged: 0 },
  changed: [{ buildSheetId: 's1', sheetName: 'Full cage', carName: 'Grey Saloon', builder: { id: 'u1', displayName: 'Robin Hale' }, classId: 'club-saloon', before: 'pass', after: 'fail' }],
};

function job(state: JobProgressWire['state'], done: number, extra: Partial<JobProgressWire> = {}): JobProgressWire {
  return { id: 'j1', queue: 'ruleset.impact', state, total: 2540, done, failed: 0, error: null, attempts: 1, createdAt: '', updatedAt: '', finishedAt: null, result: null, ...extra };
}

beforeEach(() => vi.useFakeTimers());
afterEach(() => {
  vi.useRealTimers();
  vi.clearAllMocks();
});

describe('useRulebookImpact', () => {
  const setup = () => effectScope().run(() => useRulebookImpact(ref('v1'), { pollMs: 1000 }))!;

  it('starts the job and follows it until its result is there', async () => {
    api.startImpact.mockResolvedValue(job('queued', 0, { total: null }));
    api.jobProgress.mockResolvedValueOnce(job('running', 1200)).mockResolvedValueOnce(job('completed', 2540, { result: { kind: 'impact', impact } }));
    const im = setup();
    await im.run();
    expect(api.startImpact).toHaveBeenCalledWith('v1');
    expect([im.running.value, im.impact.value]).toEqual([true, null]);
    await vi.advanceTimersByTimeAsync(1000);
    expect(im.job.value).toMatchObject({ state: 'running', done: 1200 });
    await vi.advanceTimersByTimeAsync(1000);
    expect([im.running.value, im.impact.value, im.error.value]).toEqual([false, impact, null]);
    await vi.advanceTimersByTimeAsync(5000);
    expect(api.jobProgress).toHaveBeenCalledTimes(2);
  });

  it('shows why a job failed, and why a start was refused', async () => {
    api.startImpact.mockResolvedValueOnce(job('queued', 0));
    api.jobProgress.mockResolvedValueOnce(job('failed', 0, { error: 'The draft was deleted before its impact was worked out.' }));
    const im = setup();
    await im.run();
    await vi.advanceTimersByTimeAsync(1000);
    expect([im.running.value, im.error.value]).toEqual([false, 'The draft was deleted before its impact was worked out.']);

    api.startImpact.mockRejectedValueOnce(new ApiError(409, 'conflict', 'Background jobs are not running on this server, so the impact cannot be worked out.'));
    await im.run();
    expect([im.running.value, im.job.value, im.error.value]).toEqual([false, null, 'Background jobs are not running on this server, so the impact cannot be worked out.']);
  });
});

describe('RulebookImpactPanel', () => {
  const panel = (props: Partial<InstanceType<typeof RulebookImpactPanel>['$props']>) =>
    mount(RulebookImpactPanel, { props: { impact: null, job: null, running: false, error: null, lockVersion: 3, classNames: (id: string) => (id === 'club-saloon' ? 'Club saloon' : id), ...props }, global });

  it('shows how far a running job has got, and lets nobody start a second one meanwhile', () => {
    const w = panel({ job: job('running', 1270), running: true });
    expect(w.get('[role="status"]').text()).toContain('Checking build sheets: 1,270 of 2,540');
    expect(w.get('[role="progressbar"]').attributes('aria-valuenow')).toBe('50');
    expect(w.get('button').attributes('disabled')).toBeDefined();
  });

  it('shows the summary with the safety notice, and says when the draft changed since', () => {
    const w = panel({ impact, job: job('completed', 2540, { result: { kind: 'impact', impact } }) });
    expect(w.get('[data-test="pass-to-fail"]').text()).toBe('1');
    expect(w.text()).toContain('2,540 build sheets checked');
    expect(w.text()).toContain('Grey Saloon');
    expect(w.text()).toContain('inspector');
    expect(w.text()).not.toContain('has changed since');
    expect(panel({ impact, lockVersion: 4 }).text()).toContain('The draft has changed since this was worked out.');
  });
});

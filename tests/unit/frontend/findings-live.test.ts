// The live findings: the draft is re-checked once the builder pauses (not per keystroke), in the
// browser against the published ruleset document, with the server's dry run only as a fallback; a
// failing tube marks the very inputs it concerns, and the marks carry the rule's section.
import { afterEach, beforeAll, beforeEach, describe, expect, test, vi } from 'vitest';
import { effectScope, nextTick, ref } from 'vue';
import { http, RETRY_DELAYS_MS } from '@/api/http';
import { forgetRulesetVersions } from '@/api/rulesets';
import { useLiveFindings, LIVE_CHECK_DELAY_MS } from '@/composables/useLiveFindings';
import { emptyDraft, type SheetDraft } from '@/composables/useBuildSheetDraft';
import { findingMarks, inputPathsForFact } from '@/components/findings/findingMarks';
import type { CheckReport } from '@contracts/report';
import type { UnitSystem } from '@domain/index';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';

// The demo club's published document, exactly as the seed loads it.
import document from '../../../rulesets/tarnwick-vale-mc-cage-regulations-2027.json';
const versionId = '7e57e57e-0000-4000-8000-000000000001';
const IN = 25.4; // F-UNIT-1: exact

let mock: ReturnType<typeof createFetchMock>;
// The engine is its own chunk, imported on the first check; load it once here so the fake timers
// below measure the debounce, not how long the test runner takes to read a module.
beforeAll(async () => {
  await import('@/composables/liveEngine');
});

beforeEach(() => {
  vi.useFakeTimers();
  http.resetCsrfToken();
  forgetRulesetVersions();
  localStorage.clear(); // no edition kept on the device from an earlier test (api/rulesets.ts)
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-live'));
  mock.on('GET', `/api/ruleset-versions/${versionId}`, json(200, { version: { id: versionId, classes: [], document } }));
});
afterEach(() => {
  vi.useRealTimers();
});

/** An open-sprint roll bar, 1,400 lb without driver: the "up to 1,500 lb" band of § C4.2.1. */
function sprintDraft(wallIn: number): SheetDraft {
  const d = emptyDraft('open-sprint');
  d.vehicle.weightWithoutDriverKg = 1400 * 0.45359237;
  d.members.push({ id: 'mh', kind: 'main_hoop', odMm: 1.625 * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom' });
  return d;
}

function start(draft: SheetDraft, units: UnitSystem = 'imperial') {
  const scope = effectScope();
  const draftRef = ref<SheetDraft | null>(draft);
  const live = scope.run(() => useLiveFindings(draftRef, ref(versionId), ref('open-sprint'), ref(units)))!;
  return { live, draftRef, stop: () => scope.stop() };
}

async function pause(ms = LIVE_CHECK_DELAY_MS) {
  await vi.advanceTimersByTimeAsync(ms);
  for (let i = 0; i < 20; i += 1) await vi.advanceTimersByTimeAsync(0);
}

const tubeFinding = (report: CheckReport | null) => report?.findings.find((f) => f.requirementId === 'tv-sprint-tubes' && f.member?.id === 'mh');

describe('checking in the browser', () => {
  test('a main hoop of 1.625 × 0.065 in fails § C4.2.1 and its wall input is marked with the reason', async () => {
    const { live, stop } = start(sprintDraft(0.065));
    await pause();

    expect(live.status.value).toBe('ready');
    expect(live.source.value).toBe('browser');
    const finding = tubeFinding(live.report.value)!;
    expect(finding.verdict).toBe('fail');
    expect(finding.citation.section).toBe('C4.2.1');
    // The rulebook's own table (rulesets/tarnwick…json, band up to 1,500 lb): 1.500 × 0.095 or 1.625 × 0.083;
    // the nearest to 1.625 × 0.065 is 1.625 × 0.083.
    const wallMark = live.marks.value['members.0.wallMm'];
    expect(wallMark.verdict).toBe('fail');
    expect(wallMark.message).toMatch(/^§ C4\.2\.1: /);
    expect(wallMark.message).toContain('wall 0.065 in is under 0.083 in');
    // The OD meets the nearest size, so only the wall is blamed; counts worked out from members mark nothing.
    expect(live.marks.value['members.0.odMm']).toBeUndefined();
    expect(live.marks.value['vehicle.memberCounts']).toBeUndefined();
    // Facts a rule needs but the sheet lacks point at their inputs as "needs a measurement".
    expect(live.marks.value['members.0.continuousPiece']?.verdict).toBe('needs_information');
    // Nothing went to the server: the browser compiled the document itself.
    expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
    stop();
  });

  test('the nearest size passes and the mark goes away', async () => {
    const { live, draftRef, stop } = start(sprintDraft(0.065));
    await pause();
    draftRef.value!.members[0].wallMm = 0.083 * IN;
    await pause();

    expect(tubeFinding(live.report.value)?.verdict).toBe('pass');
    expect(live.marks.value['members.0.wallMm']).toBeUndefined();
    stop();
  });

  test('a draft with a problem is not checked, and says how many inputs to correct', async () => {
    const draft = sprintDraft(0.095);
    draft.members[0].wallMm = 21; // half the OD (41.275 mm) is 20.6375 mm
    const { live, stop } = start(draft, 'metric');
    await pause();

    expect(live.status.value).toBe('invalid');
    expect(live.problems.value[0]).toEqual({
      path: 'members.0.wallMm',
      message: 'A wall of 21.0 mm is half the OD (41.3 mm) or more: that is a solid bar, not a tube.',
    });
    expect(live.marks.value).toEqual({});
    stop();
  });
});

describe('debounce and fallback', () => {
  test('typing quickly checks once, after the pause; the server answers when the document cannot be had', async () => {
    mock.on('GET', `/api/ruleset-versions/${versionId}`, apiError(503, 'database_unavailable', 'Down for a moment.'));
    let report: unknown = null;
    mock.on('POST', '/api/checks', (call) => {
      report = { verdict: 'fail', findings: [], summary: {} };
      return json(200, { report, echo: call.body });
    });
    const { live, draftRef, stop } = start(sprintDraft(0.08));

    for (const wall of [0.081, 0.082, 0.083, 0.09]) {
      draftRef.value!.members[0].wallMm = wall * IN;
      await nextTick();
      await vi.advanceTimersByTimeAsync(LIVE_CHECK_DELAY_MS - 50);
    }
    expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
    await pause();
    // The document's GET meets a 503 and is tried again after each pause (api/http.ts) before it gives up.
    await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS.reduce((a, b) => a + b, 0));

    const posts = mock.calls.filter((c) => c.method === 'POST');
    expect(posts).toHaveLength(1);
    const body = posts[0].body as { classId: string; unitSystem: string; specification: { members: { wallMm: number }[] } };
    expect(body.classId).toBe('open-sprint');
    expect(body.unitSystem).toBe('imperial');
    expect(body.specification.members[0].wallMm).toBeCloseTo(0.09 * IN, 9);
    expect(live.source.value).toBe('server');
    expect(live.report.value).toEqual(report);

    // The document can be had again (the signal is back): the next check runs in the browser.
    mock.on('GET', `/api/ruleset-versions/${versionId}`, json(200, { version: { id: versionId, classes: [], document } }));
    draftRef.value!.members[0].wallMm = 0.065 * IN;
    await nextTick();
    await pause();
    expect(live.source.value).toBe('browser');
    expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(1);
    expect(tubeFinding(live.report.value)?.verdict).toBe('fail');
    stop();
  });
});

describe('which inputs a fact was typed into', () => {
  test.each<[string, string[]]>([
    ['member.wallMm', ['members.2.wallMm']],
    ['member.sectionModulusMm3', ['members.2.odMm', 'members.2.wallMm']],
    ['member.minBendRadiusOverOd', ['members.2.bends']],
    ['geometry.hoopAboveHelmetMm', ['geometry.hoopAboveHelmetMm']],
    ['vehicle.weightKg', ['vehicle.weightWithDriverKg', 'vehicle.weightWithoutDriverKg']],
  ])('%s → %j', (fact, paths) => {
    expect(inputPathsForFact(fact, { member: { id: 'x', kind: 'door_bar', index: 2 }, plate: null })).toEqual(paths);
  });

  test('no report, no marks; passing and advisory findings mark nothing', () => {
    expect(findingMarks(null)).toEqual({});
  });
});

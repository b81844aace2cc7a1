// Rulebook version life cycle: every allowed and refused move, publishing with supersession or ahead
// of its date (scheduled), scheduled versions coming into force on their date, the dates the publish
// form may offer, drafts copied from the latest edition, and which versions new checks may use.
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import {
  VERSION_STATES,
  activateDueVersions,
  canTransition,
  defaultEffectiveDate,
  effectiveDateRefusal,
  canUseForNewCheck,
  isCalendarDate,
  startDraftFrom,
  suggestNextEdition,
  transitionVersion,
} from '@backend/domain/rulebook/lifecycle';
import type { RulebookVersion, VersionAction, VersionState } from '@backend/domain/rulebook/lifecycle';

const demo = JSON.parse(
  readFileSync(
    new URL('../../../../rulesets/tarnwick-vale-mc-cage-regulations-2027.json', import.meta.url),
    'utf8',
  ),
) as Record<string, unknown>;
const NOW = '2026-12-01T10:00:00.000Z';
/** The club's calendar date at NOW. */
const TODAY = '2026-12-01';

function version(over: Partial<RulebookVersion> = {}): RulebookVersion {
  return {
    id: 'v1',
    rulebookId: 'rb1',
    versionNumber: 1,
    state: 'draft',
    edition: '2027',
    effectiveDate: null,
    document: structuredClone(demo),
    publishedAt: null,
    ...over,
  };
}

describe('canTransition', () => {
  const allowed: [VersionState, VersionState][] = [
    ['draft', 'published'],
    ['draft', 'scheduled'],
    ['scheduled', 'published'],
    ['scheduled', 'superseded'],
    ['scheduled', 'retired'],
    ['published', 'superseded'],
    ['published', 'retired'],
    ['superseded', 'retired'],
  ];
  const all = VERSION_STATES.flatMap((from) =>
    VERSION_STATES.map((to) => [from, to] as [VersionState, VersionState]),
  );
  test.each(all)('%s → %s', (from, to) => {
    expect(canTransition(from, to)).toBe(allowed.some(([f, t]) => f === from && t === to));
  });
});

describe('transitionVersion: refusals', () => {
  test.each<[string, VersionState, VersionAction, string]>([
    ['edit a published version', 'published', { type: 'edit', document: {} }, 'not_a_draft'],
    ['edit a superseded version', 'superseded', { type: 'edit', document: {} }, 'not_a_draft'],
    ['edit a retired version', 'retired', { type: 'edit', document: {} }, 'not_a_draft'],
    ['delete a published version', 'published', { type: 'delete' }, 'not_a_draft'],
    ['delete a superseded version', 'superseded', { type: 'delete' }, 'not_a_draft'],
    ['delete a retired version', 'retired', { type: 'delete' }, 'not_a_draft'],
    [
      'publish a published version',
      'published',
      { type: 'publish', effectiveDate: '2027-01-01' },
      'not_a_draft',
    ],
    [
      'publish a superseded version',
      'superseded',
      { type: 'publish', effectiveDate: '2027-01-01' },
      'not_a_draft',
    ],
    ['publish a retired version', 'retired', { type: 'publish', effectiveDate: '2027-01-01' }, 'not_a_draft'],
    ['publish a scheduled version', 'scheduled', { type: 'publish', effectiveDate: '2027-01-01' }, 'not_a_draft'],
    ['edit a scheduled version', 'scheduled', { type: 'edit', document: {} }, 'not_a_draft'],
    ['delete a scheduled version', 'scheduled', { type: 'delete' }, 'not_a_draft'],
    ['retire a draft', 'draft', { type: 'retire' }, 'not_a_draft'],
    ['retire a retired version', 'retired', { type: 'retire' }, 'invalid_transition'],
    ['publish without an effective date', 'draft', { type: 'publish' }, 'effective_date_required'],
    [
      'publish on 2027-02-30',
      'draft',
      { type: 'publish', effectiveDate: '2027-02-30' },
      'invalid_effective_date',
    ],
    [
      'publish on 1 Jan 2027 written as 01/01/2027',
      'draft',
      { type: 'publish', effectiveDate: '01/01/2027' },
      'invalid_effective_date',
    ],
    [
      'edit with a bad planned date',
      'draft',
      { type: 'edit', effectiveDate: '2027-13-01' },
      'invalid_effective_date',
    ],
  ])('%s', (_name, state, action, code) => {
    const published = state === 'draft' ? {} : { effectiveDate: '2026-01-01', publishedAt: NOW };
    const r = transitionVersion(version({ state, ...published }), action, { siblings: [], now: NOW, today: TODAY });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.code).toBe(code);
      expect(r.message.length).toBeGreaterThan(10);
    }
  });

  test('publishing an invalid document lists every problem with its path', () => {
    const document = structuredClone(demo);
    (document.classes as unknown[]) = [];
    const r = transitionVersion(
      version({ document }),
      { type: 'publish', effectiveDate: '2027-01-01' },
      { siblings: [], now: NOW, today: TODAY },
    );
    expect(r).toMatchObject({ ok: false, code: 'invalid_document' });
    if (!r.ok) expect(r.problems).toContainEqual({ path: 'classes', message: 'Define at least one class' });
  });

  test('a draft older than a version published since cannot be published', () => {
    const newer = version({ id: 'v3', versionNumber: 3, state: 'published', effectiveDate: '2027-01-01' });
    const r = transitionVersion(
      version({ id: 'v2', versionNumber: 2 }),
      { type: 'publish', effectiveDate: '2027-06-01' },
      { siblings: [newer], now: NOW, today: TODAY },
    );
    expect(r).toMatchObject({ ok: false, code: 'newer_version_published' });
  });

  test('the effective date may not go back before the current version', () => {
    const current = version({ id: 'v1', state: 'published', effectiveDate: '2027-01-01' });
    const r = transitionVersion(
      version({ id: 'v2', versionNumber: 2 }),
      { type: 'publish', effectiveDate: '2026-12-31' },
      { siblings: [current], now: NOW, today: TODAY },
    );
    expect(r).toMatchObject({ ok: false, code: 'effective_date_before_current' });
  });

  test('versions of another rulebook are refused', () => {
    const foreign = version({ id: 'x', rulebookId: 'rb2', state: 'published' });
    const r = transitionVersion(
      version(),
      { type: 'publish', effectiveDate: '2027-01-01' },
      { siblings: [foreign], now: NOW, today: TODAY },
    );
    expect(r).toMatchObject({ ok: false, code: 'other_rulebook' });
  });
});

describe('transitionVersion: allowed moves', () => {
  test('publishing the first version: one change, the date written into the document', () => {
    const r = transitionVersion(
      version(),
      { type: 'publish', effectiveDate: '2026-11-01' },
      { siblings: [], now: NOW, today: TODAY },
    );
    expect(r.ok).toBe(true);
    if (!r.ok || !r.version) throw new Error('expected a version');
    expect(r.changes).toEqual([{ versionId: 'v1', from: 'draft', to: 'published' }]);
    expect(r.version).toMatchObject({
      state: 'published',
      effectiveDate: '2026-11-01',
      publishedAt: NOW,
      edition: '2027',
    });
    expect((r.version.document as { rulebook: { effectiveDate: string } }).rulebook.effectiveDate).toBe(
      '2026-11-01',
    );
  });

  test('published on its date it is in force that day: today is the last day it is not', () => {
    const on = transitionVersion(version(), { type: 'publish', effectiveDate: TODAY }, { siblings: [], now: NOW, today: TODAY });
    expect(on.ok && on.version?.state).toBe('published');
    const tomorrow = transitionVersion(version(), { type: 'publish', effectiveDate: '2026-12-02' }, { siblings: [], now: NOW, today: TODAY });
    expect(tomorrow.ok && tomorrow.version?.state).toBe('scheduled');
  });

  test('published ahead of its date it is scheduled, and the version in force stays in force', () => {
    const current = version({ id: 'v1', versionNumber: 1, state: 'published', effectiveDate: '2026-01-01' });
    const draft = version({ id: 'v2', versionNumber: 2 });
    const r = transitionVersion(draft, { type: 'publish', effectiveDate: '2027-01-01' }, { siblings: [current], now: NOW, today: TODAY });
    expect(r.ok && r.changes).toEqual([{ versionId: 'v2', from: 'draft', to: 'scheduled' }]);
    expect(r.ok && r.version).toMatchObject({ state: 'scheduled', effectiveDate: '2027-01-01', publishedAt: NOW });
  });

  test('publishing a new version supersedes the published one (and no other)', () => {
    const old = version({ id: 'v0', versionNumber: 1, state: 'superseded', effectiveDate: '2025-01-01' });
    const current = version({ id: 'v1', versionNumber: 2, state: 'published', effectiveDate: '2026-01-01' });
    const draft = version({ id: 'v2', versionNumber: 3, effectiveDate: '2026-06-01' });
    const r = transitionVersion(draft, { type: 'publish' }, { siblings: [old, current, draft], now: NOW, today: TODAY });
    expect(r.ok && r.changes).toEqual([
      { versionId: 'v2', from: 'draft', to: 'published' },
      { versionId: 'v1', from: 'published', to: 'superseded' },
    ]);
  });

  test('the same effective date as the current version is allowed (a corrected reissue)', () => {
    const current = version({ id: 'v1', state: 'published', effectiveDate: '2026-10-01' });
    const r = transitionVersion(
      version({ id: 'v2', versionNumber: 2 }),
      { type: 'publish', effectiveDate: '2026-10-01' },
      { siblings: [current], now: NOW, today: TODAY },
    );
    expect(r.ok && r.changes).toEqual([
      { versionId: 'v2', from: 'draft', to: 'published' },
      { versionId: 'v1', from: 'published', to: 'superseded' },
    ]);
  });

  test('a new version may not be dated before a scheduled one, and the message says which', () => {
    const current = version({ id: 'v1', versionNumber: 1, state: 'published', effectiveDate: '2026-01-01' });
    const scheduled = version({ id: 'v2', versionNumber: 2, state: 'scheduled', effectiveDate: '2027-01-01' });
    const r = transitionVersion(version({ id: 'v3', versionNumber: 3 }), { type: 'publish', effectiveDate: '2026-12-15' }, { siblings: [current, scheduled], now: NOW, today: TODAY });
    expect(r).toMatchObject({ ok: false, code: 'effective_date_before_current' });
    if (!r.ok) expect(r.message).toBe('The effective date 15 Dec 2026 is before 1 Jan 2027, when the scheduled version 2 takes effect. Choose 1 Jan 2027 or later.');
  });

  test('a scheduled version whose date has come is replaced with the one in force by a newer edition in force today', () => {
    // The clock had not run yet: v2 is still scheduled though its date is today.
    const current = version({ id: 'v1', versionNumber: 1, state: 'published', effectiveDate: '2026-01-01' });
    const due = version({ id: 'v2', versionNumber: 2, state: 'scheduled', effectiveDate: TODAY });
    const r = transitionVersion(version({ id: 'v3', versionNumber: 3 }), { type: 'publish', effectiveDate: TODAY }, { siblings: [current, due], now: NOW, today: TODAY });
    expect(r.ok && r.changes).toEqual([
      { versionId: 'v3', from: 'draft', to: 'published' },
      { versionId: 'v1', from: 'published', to: 'superseded' },
      { versionId: 'v2', from: 'scheduled', to: 'superseded' },
    ]);
  });

  test('editing a draft replaces its document and takes the edition from it', () => {
    const document = structuredClone(demo);
    (document.rulebook as { edition: string }).edition = '2027 rev 2';
    const r = transitionVersion(
      version(),
      { type: 'edit', document, effectiveDate: '2027-04-01' },
      { siblings: [], now: NOW, today: TODAY },
    );
    expect(r.ok && r.version).toMatchObject({
      state: 'draft',
      edition: '2027 rev 2',
      effectiveDate: '2027-04-01',
      document,
    });
    expect(r.ok && r.changes).toEqual([]);
  });

  test('a draft may be saved incomplete', () => {
    const r = transitionVersion(
      version(),
      { type: 'edit', document: { rulebook: {} } },
      { siblings: [], now: NOW, today: TODAY },
    );
    expect(r.ok && r.version).toMatchObject({ document: { rulebook: {} }, edition: '2027' });
  });

  test('deleting a draft', () => {
    const r = transitionVersion(version(), { type: 'delete' }, { siblings: [], now: NOW, today: TODAY });
    expect(r).toEqual({
      ok: true,
      version: null,
      changes: [{ versionId: 'v1', from: 'draft', to: 'deleted' }],
    });
  });

  test.each<VersionState>(['scheduled', 'published', 'superseded'])('retiring a %s version', (state) => {
    const r = transitionVersion(
      version({ state, effectiveDate: '2027-01-01' }),
      { type: 'retire' },
      { siblings: [], now: NOW, today: TODAY },
    );
    expect(r.ok && r.changes).toEqual([{ versionId: 'v1', from: state, to: 'retired' }]);
    expect(r.ok && r.version?.state).toBe('retired');
  });
});

describe('new checks', () => {
  test.each<[VersionState, boolean, string | undefined]>([
    ['draft', false, 'version_unpublished'],
    ['scheduled', true, undefined],
    ['published', true, undefined],
    ['superseded', true, undefined],
    ['retired', false, 'version_retired'],
  ])('%s version usable: %s', (state, ok, code) => {
    const r = canUseForNewCheck({ state, versionNumber: 4 });
    expect(r.ok).toBe(ok);
    if (!r.ok) expect(r.code).toBe(code);
    else expect([r.superseded, r.scheduled]).toEqual([state === 'superseded', state === 'scheduled']);
  });
});

describe('scheduled versions come into force on their date', () => {
  const inForce = version({ id: 'v1', versionNumber: 1, state: 'published', effectiveDate: '2026-01-01' });
  const next = version({ id: 'v2', versionNumber: 2, state: 'scheduled', effectiveDate: '2027-01-01' });
  test.each<[string, string, { versionId: string; from: VersionState; to: VersionState }[]]>([
    ['the day before: nothing moves', '2026-12-31', []],
    ['on the date: in force, and the one before replaced', '2027-01-01', [
      { versionId: 'v1', from: 'published', to: 'superseded' },
      { versionId: 'v2', from: 'scheduled', to: 'published' },
    ]],
    ['a clock that missed the day catches up', '2027-03-04', [
      { versionId: 'v1', from: 'published', to: 'superseded' },
      { versionId: 'v2', from: 'scheduled', to: 'published' },
    ]],
  ])('%s', (_name, today, changes) => {
    expect(activateDueVersions([inForce, next], today)).toEqual(changes);
  });

  test('two due on the same catch-up: the higher number wins, the other is superseded without being in force', () => {
    const later = version({ id: 'v3', versionNumber: 3, state: 'scheduled', effectiveDate: '2027-02-01' });
    expect(activateDueVersions([inForce, next, later], '2027-02-01')).toEqual([
      { versionId: 'v1', from: 'published', to: 'superseded' },
      { versionId: 'v2', from: 'scheduled', to: 'superseded' },
      { versionId: 'v3', from: 'scheduled', to: 'published' },
    ]);
  });

  test('a rulebook whose first edition is scheduled has nothing in force until its date', () => {
    const first = version({ id: 'v1', versionNumber: 1, state: 'scheduled', effectiveDate: '2027-01-01' });
    expect(activateDueVersions([first], '2026-12-31')).toEqual([]);
    expect(activateDueVersions([first], '2027-01-01')).toEqual([{ versionId: 'v1', from: 'scheduled', to: 'published' }]);
  });

  test('nothing to do once in force (idempotent)', () => {
    expect(activateDueVersions([inForce, { ...next, state: 'retired' }], '2027-06-01')).toEqual([]);
  });
});

describe('the effective date the publish form offers and refuses', () => {
  const inForce = { state: 'published' as const, effectiveDate: '2026-11-01', versionNumber: 1 };
  test('today in the club when nothing is dated later', () => {
    expect(defaultEffectiveDate([inForce], TODAY)).toBe(TODAY);
    expect(effectiveDateRefusal(defaultEffectiveDate([inForce], TODAY), [inForce])).toBeNull();
  });
  test('the current version’s date when it is later than today (so the default is never refused)', () => {
    const ahead = { state: 'published' as const, effectiveDate: '2027-01-01', versionNumber: 1 };
    const scheduled = { state: 'scheduled' as const, effectiveDate: '2027-03-01', versionNumber: 2 };
    expect(defaultEffectiveDate([ahead], TODAY)).toBe('2027-01-01');
    expect(defaultEffectiveDate([ahead, scheduled], TODAY)).toBe('2027-03-01');
    expect(effectiveDateRefusal(defaultEffectiveDate([ahead, scheduled], TODAY), [ahead, scheduled])).toBeNull();
  });
  test.each([
    ['', 'effective_date_required'],
    ['2026-02-30', 'invalid_effective_date'],
    ['2026-10-31', 'effective_date_before_current'],
  ])('%j is refused (%s)', (date, code) => {
    expect(effectiveDateRefusal(date, [inForce])).toMatchObject({ ok: false, code });
  });
  test('replaced and withdrawn versions do not hold a new date back', () => {
    const old = [{ state: 'superseded' as const, effectiveDate: '2027-01-01', versionNumber: 1 }, { state: 'retired' as const, effectiveDate: '2028-01-01', versionNumber: 2 }];
    expect(effectiveDateRefusal('2026-12-01', old)).toBeNull();
  });
});

describe('startDraftFrom', () => {
  test.each([
    ['2027', '2028'],
    ['Issue 3', 'Issue 4'],
    ['2027.1', '2027.2'],
    ['Rev 09', 'Rev 10'],
    ['Spring edition', 'Spring edition (revised)'],
    ['', '1'],
  ])('edition %j → %j', (from, to) => {
    expect(suggestNextEdition(from)).toBe(to);
  });

  test('copies the document, bumps number and edition, clears the date', () => {
    const latest = version({ id: 'v2', versionNumber: 2, state: 'published', effectiveDate: '2027-01-01' });
    const older = version({ id: 'v1', versionNumber: 1, state: 'superseded' });
    const draft = startDraftFrom(latest, [older, latest]);
    if ('ok' in draft) throw new Error(draft.message);
    expect(draft).toMatchObject({
      rulebookId: 'rb1',
      versionNumber: 3,
      state: 'draft',
      edition: '2028',
      effectiveDate: null,
      copiedFromId: 'v2',
    });
    const copy = draft.document as typeof demo & { rulebook: { edition: string } };
    expect(copy.rulebook.edition).toBe('2028');
    expect(copy.requirements).toEqual(demo.requirements);
    (copy.requirements as unknown[]).pop();
    expect((latest.document as typeof demo).requirements).toHaveLength(
      (demo.requirements as unknown[]).length,
    );
  });

  test('the number follows the highest version, even a retired one', () => {
    const latest = version({ id: 'v2', versionNumber: 2, state: 'published' });
    const retired = version({ id: 'v5', versionNumber: 5, state: 'retired' });
    const draft = startDraftFrom(latest, [retired]);
    expect('versionNumber' in draft && draft.versionNumber).toBe(6);
  });

  test('refused while another draft is open', () => {
    const latest = version({ id: 'v2', versionNumber: 2, state: 'published' });
    expect(startDraftFrom(latest, [version({ id: 'v3', versionNumber: 3 })])).toMatchObject({
      ok: false,
      code: 'draft_exists',
    });
  });
});

test.each([
  ['2027-01-01', true],
  ['2028-02-29', true],
  ['2027-02-29', false],
  ['2027-1-01', false],
  ['2027-04-31', false],
])('isCalendarDate(%s) = %s', (text, ok) => {
  expect(isCalendarDate(text)).toBe(ok);
});

test('the moves match the ones the database trigger allows', async () => {
  const { allowedStatusMoves } = await import('@backend/entities/ruleset-version.entity');
  for (const from of VERSION_STATES) {
    for (const to of VERSION_STATES)
      expect(canTransition(from, to), `${from} → ${to}`).toBe(allowedStatusMoves[from].includes(to));
  }
});

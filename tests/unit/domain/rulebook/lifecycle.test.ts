// Rulebook version life cycle: every allowed and refused move, publishing with supersession,
// drafts copied from the latest edition, and which versions new checks may use.
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import {
  VERSION_STATES,
  canTransition,
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
    const r = transitionVersion(version({ state, ...published }), action, { siblings: [], now: NOW });
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
      { siblings: [], now: NOW },
    );
    expect(r).toMatchObject({ ok: false, code: 'invalid_document' });
    if (!r.ok) expect(r.problems).toContainEqual({ path: 'classes', message: 'Define at least one class' });
  });

  test('a draft older than a version published since cannot be published', () => {
    const newer = version({ id: 'v3', versionNumber: 3, state: 'published', effectiveDate: '2027-01-01' });
    const r = transitionVersion(
      version({ id: 'v2', versionNumber: 2 }),
      { type: 'publish', effectiveDate: '2027-06-01' },
      { siblings: [newer], now: NOW },
    );
    expect(r).toMatchObject({ ok: false, code: 'newer_version_published' });
  });

  test('the effective date may not go back before the current version', () => {
    const current = version({ id: 'v1', state: 'published', effectiveDate: '2027-01-01' });
    const r = transitionVersion(
      version({ id: 'v2', versionNumber: 2 }),
      { type: 'publish', effectiveDate: '2026-12-31' },
      { siblings: [current], now: NOW },
    );
    expect(r).toMatchObject({ ok: false, code: 'effective_date_before_current' });
  });

  test('versions of another rulebook are refused', () => {
    const foreign = version({ id: 'x', rulebookId: 'rb2', state: 'published' });
    const r = transitionVersion(
      version(),
      { type: 'publish', effectiveDate: '2027-01-01' },
      { siblings: [foreign], now: NOW },
    );
    expect(r).toMatchObject({ ok: false, code: 'other_rulebook' });
  });
});

describe('transitionVersion: allowed moves', () => {
  test('publishing the first version: one change, the date written into the document', () => {
    const r = transitionVersion(
      version(),
      { type: 'publish', effectiveDate: '2027-02-01' },
      { siblings: [], now: NOW },
    );
    expect(r.ok).toBe(true);
    if (!r.ok || !r.version) throw new Error('expected a version');
    expect(r.changes).toEqual([{ versionId: 'v1', from: 'draft', to: 'published' }]);
    expect(r.version).toMatchObject({
      state: 'published',
      effectiveDate: '2027-02-01',
      publishedAt: NOW,
      edition: '2027',
    });
    expect((r.version.document as { rulebook: { effectiveDate: string } }).rulebook.effectiveDate).toBe(
      '2027-02-01',
    );
  });

  test('publishing a new version supersedes the published one (and no other)', () => {
    const old = version({ id: 'v0', versionNumber: 1, state: 'superseded', effectiveDate: '2025-01-01' });
    const current = version({ id: 'v1', versionNumber: 2, state: 'published', effectiveDate: '2026-01-01' });
    const draft = version({ id: 'v2', versionNumber: 3, effectiveDate: '2027-01-01' });
    const r = transitionVersion(draft, { type: 'publish' }, { siblings: [old, current, draft], now: NOW });
    expect(r.ok && r.changes).toEqual([
      { versionId: 'v2', from: 'draft', to: 'published' },
      { versionId: 'v1', from: 'published', to: 'superseded' },
    ]);
  });

  test('the same effective date as the current version is allowed (a corrected reissue)', () => {
    const current = version({ id: 'v1', state: 'published', effectiveDate: '2027-01-01' });
    const r = transitionVersion(
      version({ id: 'v2', versionNumber: 2 }),
      { type: 'publish', effectiveDate: '2027-01-01' },
      { siblings: [current], now: NOW },
    );
    expect(r.ok).toBe(true);
  });

  test('editing a draft replaces its document and takes the edition from it', () => {
    const document = structuredClone(demo);
    (document.rulebook as { edition: string }).edition = '2027 rev 2';
    const r = transitionVersion(
      version(),
      { type: 'edit', document, effectiveDate: '2027-04-01' },
      { siblings: [], now: NOW },
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
      { siblings: [], now: NOW },
    );
    expect(r.ok && r.version).toMatchObject({ document: { rulebook: {} }, edition: '2027' });
  });

  test('deleting a draft', () => {
    const r = transitionVersion(version(), { type: 'delete' }, { siblings: [], now: NOW });
    expect(r).toEqual({
      ok: true,
      version: null,
      changes: [{ versionId: 'v1', from: 'draft', to: 'deleted' }],
    });
  });

  test.each<VersionState>(['published', 'superseded'])('retiring a %s version', (state) => {
    const r = transitionVersion(
      version({ state, effectiveDate: '2027-01-01' }),
      { type: 'retire' },
      { siblings: [], now: NOW },
    );
    expect(r.ok && r.changes).toEqual([{ versionId: 'v1', from: state, to: 'retired' }]);
    expect(r.ok && r.version?.state).toBe('retired');
  });
});

describe('new checks', () => {
  test.each<[VersionState, boolean, string | undefined]>([
    ['draft', false, 'version_unpublished'],
    ['published', true, undefined],
    ['superseded', true, undefined],
    ['retired', false, 'version_retired'],
  ])('%s version usable: %s', (state, ok, code) => {
    const r = canUseForNewCheck({ state, versionNumber: 4 });
    expect(r.ok).toBe(ok);
    if (!r.ok) expect(r.code).toBe(code);
    else expect(r.superseded).toBe(state === 'superseded');
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

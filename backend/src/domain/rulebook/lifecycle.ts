// The life of one rulebook version: draft → scheduled (published ahead of its date) → in force
// ("published") → superseded or retired. Pure rules only: the service loads the versions, asks here
// what may happen, and writes the changes returned in one transaction. The allowed moves mirror the
// database trigger on ruleset_versions, so a refusal here is the friendly explanation of what the
// database would refuse anyway. "Today" is always passed in: it is the club's calendar date
// (domain/dates.ts calendarDateIn), never the UTC date of the server.
import type { RulesetDocument, DocumentProblem } from '../../contracts/ruleset.js';
import { validateRulesetDocument } from '../rules/validate.js';
import { formatIsoDate } from '../dates.js';

export const VERSION_STATES = ['draft', 'scheduled', 'published', 'superseded', 'retired'] as const;
export type VersionState = (typeof VERSION_STATES)[number];

/**
 * Status moves (besides staying put). A scheduled version comes into force on its date (or is
 * overtaken on that day by a newer one due the same day); superseding happens only as a side effect
 * of a newer version coming into force.
 */
export const VERSION_MOVES: Readonly<Record<VersionState, readonly VersionState[]>> = {
  draft: ['published', 'scheduled'],
  scheduled: ['published', 'superseded', 'retired'],
  published: ['superseded', 'retired'],
  superseded: ['retired'],
  retired: [],
};

export function canTransition(from: VersionState, to: VersionState): boolean {
  return VERSION_MOVES[from].includes(to);
}

/** What the rules need to know about a version; the service maps its row onto this. */
export interface RulebookVersion {
  id: string;
  rulebookId: string;
  versionNumber: number;
  state: VersionState;
  edition: string;
  /** YYYY-MM-DD; a draft may not have one yet, a published version always has. */
  effectiveDate: string | null;
  /** A draft's document may be incomplete; a published one passed validateRulesetDocument. */
  document: unknown;
  /** ISO timestamp. */
  publishedAt: string | null;
}

export type VersionAction =
  /** Replaces the draft's document and/or sets its planned effective date (null clears it). */
  | { type: 'edit'; document?: unknown; effectiveDate?: string | null }
  | { type: 'delete' }
  | { type: 'publish'; effectiveDate?: string }
  | { type: 'retire' };

export interface TransitionContext {
  /** Every other version of the same rulebook (the version itself may be included; it is skipped). */
  siblings: readonly RulebookVersion[];
  /** ISO timestamp recorded as publishedAt. */
  now: string;
  /** The club's calendar date (YYYY-MM-DD): a version dated later is scheduled, not in force. Publishing needs it. */
  today?: string;
}

export interface StateChange {
  versionId: string;
  from: VersionState;
  to: VersionState | 'deleted';
}

export type LifecycleRefusalCode =
  | 'not_a_draft'
  | 'invalid_transition'
  | 'invalid_document'
  | 'effective_date_required'
  | 'invalid_effective_date'
  | 'effective_date_before_current'
  | 'newer_version_published'
  | 'other_rulebook'
  | 'draft_exists'
  | 'version_retired'
  | 'version_unpublished';

export interface LifecycleRefusal {
  ok: false;
  code: LifecycleRefusalCode;
  message: string;
  /** Document problems for invalid_document, with their JSON paths. */
  problems?: DocumentProblem[];
}

export interface TransitionResult {
  ok: true;
  /** The version after the action; null when it was deleted. */
  version: RulebookVersion | null;
  /** State changes to write, this version's first; empty for an edit. */
  changes: StateChange[];
}

const refuse = (
  code: LifecycleRefusalCode,
  message: string,
  problems?: DocumentProblem[],
): LifecycleRefusal => (problems ? { ok: false, code, message, problems } : { ok: false, code, message });

const STATE_WORDS: Readonly<Record<VersionState, string>> = {
  draft: 'a draft',
  scheduled: 'scheduled',
  published: 'in force',
  superseded: 'superseded by a newer version',
  retired: 'retired',
};

/** A real calendar date written YYYY-MM-DD (2027-02-30 is refused). */
export function isCalendarDate(text: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const date = new Date(Date.UTC(y, mo - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === mo - 1 && date.getUTCDate() === d;
}

function editionOf(document: unknown): string | undefined {
  if (typeof document !== 'object' || document === null) return undefined;
  const rulebook = (document as { rulebook?: unknown }).rulebook;
  if (typeof rulebook !== 'object' || rulebook === null) return undefined;
  const edition = (rulebook as { edition?: unknown }).edition;
  return typeof edition === 'string' && edition.trim() !== '' ? edition.trim() : undefined;
}

export function transitionVersion(
  version: RulebookVersion,
  action: VersionAction,
  context: TransitionContext,
): TransitionResult | LifecycleRefusal {
  const siblings = context.siblings.filter((s) => s.id !== version.id);
  if (siblings.some((s) => s.rulebookId !== version.rulebookId)) {
    return refuse('other_rulebook', 'The versions given belong to another rulebook.');
  }
  switch (action.type) {
    case 'edit':
      if (version.state !== 'draft')
        return refuse(
          'not_a_draft',
          `Version ${version.versionNumber} is ${STATE_WORDS[version.state]}; only a draft can be edited. Start a new draft from it instead.`,
        );
      if (typeof action.effectiveDate === 'string' && !isCalendarDate(action.effectiveDate)) {
        return refuse(
          'invalid_effective_date',
          `"${action.effectiveDate}" is not a date written YYYY-MM-DD.`,
        );
      }
      {
        // Drafts may be saved incomplete; validity is demanded when publishing.
        const document = action.document === undefined ? version.document : action.document;
        const effectiveDate =
          action.effectiveDate === undefined ? version.effectiveDate : action.effectiveDate;
        return {
          ok: true,
          version: { ...version, document, effectiveDate, edition: editionOf(document) ?? version.edition },
          changes: [],
        };
      }
    case 'delete':
      if (version.state !== 'draft')
        return refuse(
          'not_a_draft',
          `Version ${version.versionNumber} is ${STATE_WORDS[version.state]}; only a draft can be deleted. Retire it instead.`,
        );
      return { ok: true, version: null, changes: [{ versionId: version.id, from: 'draft', to: 'deleted' }] };
    case 'publish':
      return publish(version, action.effectiveDate, siblings, context.now, context.today);
    case 'retire':
      if (!canTransition(version.state, 'retired')) {
        return refuse(
          version.state === 'draft' ? 'not_a_draft' : 'invalid_transition',
          version.state === 'draft'
            ? `Version ${version.versionNumber} is a draft; delete it instead of retiring it.`
            : `Version ${version.versionNumber} is already retired.`,
        );
      }
      return {
        ok: true,
        version: { ...version, state: 'retired' },
        changes: [{ versionId: version.id, from: version.state, to: 'retired' }],
      };
  }
}

/**
 * The versions whose date a new edition may not precede: the one in force and any scheduled ahead of
 * it. A new edition can take effect on the same day as the latest of them (it then wins that day, as
 * the higher number) but not before, so the order of the numbers is the order of the dates.
 */
export function latestDatedSibling(siblings: readonly Pick<RulebookVersion, 'state' | 'effectiveDate' | 'versionNumber'>[]) {
  let latest: Pick<RulebookVersion, 'state' | 'effectiveDate' | 'versionNumber'> | undefined;
  for (const s of siblings) {
    if ((s.state !== 'published' && s.state !== 'scheduled') || !s.effectiveDate) continue;
    if (!latest || s.effectiveDate > latest.effectiveDate! || (s.effectiveDate === latest.effectiveDate && s.versionNumber > latest.versionNumber)) latest = s;
  }
  return latest;
}

/**
 * Why the server would refuse `date` as a new edition's effective date, or null when it is fine. The
 * publish dialog asks the same question before it sends anything, so the form and the server agree.
 */
export function effectiveDateRefusal(
  date: string,
  siblings: readonly Pick<RulebookVersion, 'state' | 'effectiveDate' | 'versionNumber'>[],
): LifecycleRefusal | null {
  if (!date) return refuse('effective_date_required', 'Give the date this version takes effect before publishing it.');
  if (!isCalendarDate(date)) return refuse('invalid_effective_date', `"${date}" is not a date written YYYY-MM-DD.`);
  const latest = latestDatedSibling(siblings);
  if (latest?.effectiveDate && date < latest.effectiveDate) {
    const when = latest.state === 'scheduled' ? 'takes effect' : 'took effect';
    const which = latest.state === 'scheduled' ? 'scheduled version' : 'current version';
    return refuse(
      'effective_date_before_current',
      `The effective date ${formatIsoDate(date)} is before ${formatIsoDate(latest.effectiveDate)}, when the ${which} ${latest.versionNumber} ${when}. Choose ${formatIsoDate(latest.effectiveDate)} or later.`,
    );
  }
  return null;
}

/** The date the publish form offers first: today in the club, or the first date the server accepts. */
export function defaultEffectiveDate(
  siblings: readonly Pick<RulebookVersion, 'state' | 'effectiveDate' | 'versionNumber'>[],
  today: string,
): string {
  const latest = latestDatedSibling(siblings)?.effectiveDate;
  return latest && latest > today ? latest : today;
}

/** Whether a version of this date is in force on `today` once published (else it is scheduled). */
export function inForceOn(effectiveDate: string, today: string): boolean {
  return effectiveDate <= today;
}

function publish(
  version: RulebookVersion,
  requestedDate: string | undefined,
  siblings: readonly RulebookVersion[],
  now: string,
  today: string | undefined,
): TransitionResult | LifecycleRefusal {
  if (today === undefined) throw new Error('transitionVersion: publishing needs the club\'s date today');
  if (version.state !== 'draft')
    return refuse(
      'not_a_draft',
      `Version ${version.versionNumber} is ${STATE_WORDS[version.state]}; only a draft can be published.`,
    );
  const effectiveDate = requestedDate ?? version.effectiveDate;
  if (!effectiveDate)
    return refuse('effective_date_required', 'Give the date this version takes effect before publishing it.');
  if (!isCalendarDate(effectiveDate))
    return refuse('invalid_effective_date', `"${effectiveDate}" is not a date written YYYY-MM-DD.`);
  const newer = siblings.find((s) => s.state !== 'draft' && s.versionNumber > version.versionNumber);
  if (newer) {
    return refuse(
      'newer_version_published',
      `Version ${newer.versionNumber} was published after this draft was started; start a new draft from it instead.`,
    );
  }
  const dateRefusal = effectiveDateRefusal(effectiveDate, siblings);
  if (dateRefusal) return dateRefusal;
  // The published document states the date it took effect, so the two can never disagree.
  const withDate = withRulebookField(version.document, 'effectiveDate', effectiveDate);
  const validation = validateRulesetDocument(withDate);
  if (!validation.ok) {
    const n = validation.problems.length;
    return refuse(
      'invalid_document',
      `The document has ${n} problem${n === 1 ? '' : 's'} to fix before it can be published.`,
      validation.problems,
    );
  }
  const document: RulesetDocument = validation.document;
  const state: VersionState = inForceOn(effectiveDate, today) ? 'published' : 'scheduled';
  const changes: StateChange[] = [{ versionId: version.id, from: 'draft', to: state }];
  // In force today: whatever was in force or scheduled before it (all dated no later) is replaced now.
  // Scheduled: the version in force stays in force until the date comes (activateDueVersions).
  if (state === 'published') {
    for (const s of siblings) {
      if (s.state === 'published' || s.state === 'scheduled') changes.push({ versionId: s.id, from: s.state, to: 'superseded' });
    }
  }
  return {
    ok: true,
    version: {
      ...version,
      state,
      document,
      edition: document.rulebook.edition,
      effectiveDate,
      publishedAt: now,
    },
    changes,
  };
}

/**
 * The moves due on `today` for one rulebook's versions: of the versions in force or scheduled whose
 * date has come, the highest-numbered is in force and the others are superseded. Empty when nothing
 * is due. Superseding moves come first, so the one-in-force rule of the database holds at each step.
 */
export function activateDueVersions(versions: readonly RulebookVersion[], today: string): StateChange[] {
  const due = versions.filter((v) => (v.state === 'published' || v.state === 'scheduled') && v.effectiveDate !== null && v.effectiveDate <= today);
  if (due.length === 0) return [];
  const winner = due.reduce((a, b) => (b.versionNumber > a.versionNumber ? b : a));
  const changes: StateChange[] = due.filter((v) => v.id !== winner.id).map((v) => ({ versionId: v.id, from: v.state, to: 'superseded' }));
  if (winner.state === 'scheduled') changes.push({ versionId: winner.id, from: 'scheduled', to: 'published' });
  return changes;
}

function withRulebookField(document: unknown, field: string, value: string): unknown {
  if (typeof document !== 'object' || document === null || Array.isArray(document)) return document;
  const d = document as Record<string, unknown>;
  const rulebook =
    typeof d.rulebook === 'object' && d.rulebook !== null && !Array.isArray(d.rulebook)
      ? (d.rulebook as Record<string, unknown>)
      : {};
  return { ...d, rulebook: { ...rulebook, [field]: value } };
}

/** Whether a builder may start a new check against this version. */
export function canUseForNewCheck(
  version: Pick<RulebookVersion, 'state' | 'versionNumber'>,
): { ok: true; superseded: boolean; scheduled: boolean } | LifecycleRefusal {
  if (version.state === 'retired')
    return refuse(
      'version_retired',
      `Version ${version.versionNumber} is retired and cannot be used for new checks.`,
    );
  if (version.state === 'draft')
    return refuse(
      'version_unpublished',
      `Version ${version.versionNumber} is a draft; checks use published versions.`,
    );
  // A scheduled version may be checked against ahead of its date, so builders learn early.
  return { ok: true, superseded: version.state === 'superseded', scheduled: version.state === 'scheduled' };
}

/**
 * The next edition's name: a trailing number goes up by one ("2027" → "2028", "Issue 3" →
 * "Issue 4", "2027.1" → "2027.2"); anything else gets " (revised)". Only a suggestion for the form.
 */
export function suggestNextEdition(edition: string): string {
  const trimmed = edition.trim();
  const m = /^(.*?)(\d+)$/.exec(trimmed);
  if (!m) return trimmed === '' ? '1' : `${trimmed} (revised)`;
  const next = String(Number(m[2]) + 1).padStart(m[2].length, '0');
  return `${m[1]}${next}`;
}

export interface NewDraft {
  rulebookId: string;
  versionNumber: number;
  state: 'draft';
  edition: string;
  effectiveDate: null;
  document: unknown;
  publishedAt: null;
  /** The version it was copied from. */
  copiedFromId: string;
}

/**
 * A new draft as a copy of `latest` (the newest published or superseded version, normally). The
 * effective date is cleared on purpose: a copied date would be published unnoticed.
 */
export function startDraftFrom(
  latest: RulebookVersion,
  siblings: readonly RulebookVersion[] = [],
): NewDraft | LifecycleRefusal {
  const all = [latest, ...siblings.filter((s) => s.id !== latest.id)];
  if (all.some((s) => s.rulebookId !== latest.rulebookId))
    return refuse('other_rulebook', 'The versions given belong to another rulebook.');
  const openDraft = all.find((s) => s.state === 'draft');
  if (openDraft)
    return refuse(
      'draft_exists',
      `Version ${openDraft.versionNumber} is already a draft; edit it or delete it first.`,
    );
  const edition = suggestNextEdition(latest.edition);
  // A JSON round trip: the document is JSON by contract, and the copy must share nothing with it.
  const copy = JSON.parse(JSON.stringify(latest.document ?? null)) as unknown;
  return {
    rulebookId: latest.rulebookId,
    versionNumber: Math.max(...all.map((s) => s.versionNumber)) + 1,
    state: 'draft',
    edition,
    effectiveDate: null,
    document: withRulebookField(copy, 'edition', edition),
    publishedAt: null,
    copiedFromId: latest.id,
  };
}

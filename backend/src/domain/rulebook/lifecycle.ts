// The life of one rulebook version: draft → published → superseded or retired. Pure rules only:
// the service loads the versions, asks here what may happen, and writes the changes returned in one
// transaction. The allowed moves mirror the database trigger on ruleset_versions, so a refusal here
// is the friendly explanation of what the database would refuse anyway.
import type { RulesetDocument, DocumentProblem } from '../../contracts/ruleset.js';
import { validateRulesetDocument } from '../rules/validate.js';

export const VERSION_STATES = ['draft', 'published', 'superseded', 'retired'] as const;
export type VersionState = (typeof VERSION_STATES)[number];

/** Status moves (besides staying put). Superseding happens only as a side effect of publishing. */
export const VERSION_MOVES: Readonly<Record<VersionState, readonly VersionState[]>> = {
  draft: ['published'],
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
  published: 'published',
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
      return publish(version, action.effectiveDate, siblings, context.now);
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

function publish(
  version: RulebookVersion,
  requestedDate: string | undefined,
  siblings: readonly RulebookVersion[],
  now: string,
): TransitionResult | LifecycleRefusal {
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
  const current = siblings.find((s) => s.state === 'published');
  if (current?.effectiveDate && effectiveDate < current.effectiveDate) {
    return refuse(
      'effective_date_before_current',
      `The effective date ${effectiveDate} is before ${current.effectiveDate}, when the current version ${current.versionNumber} took effect.`,
    );
  }
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
  const changes: StateChange[] = [{ versionId: version.id, from: 'draft', to: 'published' }];
  if (current) changes.push({ versionId: current.id, from: 'published', to: 'superseded' });
  return {
    ok: true,
    version: {
      ...version,
      state: 'published',
      document,
      edition: document.rulebook.edition,
      effectiveDate,
      publishedAt: now,
    },
    changes,
  };
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
): { ok: true; superseded: boolean } | LifecycleRefusal {
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
  return { ok: true, superseded: version.state === 'superseded' };
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

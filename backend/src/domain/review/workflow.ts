// The review of a builder's submitted check: pending → in_review (a steward claims it) →
// approved | changes_requested | rejected, or withdrawn by the builder. Pure: each action returns
// the new submission and the audit event to store, or a typed refusal saying why not. Every action
// carries the state and version the client last saw, so two stewards deciding at once cannot both win.
import {
  overallWithWaivers,
  WAIVABLE_VERDICTS,
  WAIVER_REASON_MAX,
  WAIVER_REASON_MIN,
  findingKey,
} from './waivers.js';
import type { ReviewFinding, Waiver } from './waivers.js';
import type { ClubRole } from '../../contracts/roles.js';
import { NOTE_MAX, NOTE_MIN } from '../../contracts/review-limits.js';
import { SUBMISSION_STATE_IN_SENTENCE } from '../../contracts/verdict-words.js';

export const SUBMISSION_STATES = [
  'pending',
  'in_review',
  'approved',
  'changes_requested',
  'rejected',
  'withdrawn',
] as const;
export type SubmissionState = (typeof SUBMISSION_STATES)[number];
export const FINAL_STATES: readonly SubmissionState[] = [
  'approved',
  'changes_requested',
  'rejected',
  'withdrawn',
];

export type { ClubRole };
export interface ReviewActor {
  id: string;
  /** The actor's roles in the submission's club. */
  roles: readonly ClubRole[];
}

export interface Submission {
  id: string;
  state: SubmissionState;
  /** Goes up by one with every action; the client sends the one it saw. */
  version: number;
  builderId: string;
  checkRunId: string;
  assignedStewardId: string | null;
  previousSubmissionId: string | null;
  resubmittedAsId: string | null;
  findings: readonly ReviewFinding[];
  waivers: readonly Waiver[];
  /** The note of the last decision (what to change, why rejected). */
  decisionNote: string | null;
}

export interface Expected {
  state: SubmissionState;
  version: number;
}

export type ReviewAction =
  | { type: 'claim'; expected: Expected }
  | { type: 'release'; expected: Expected; note?: string }
  | { type: 'waive'; expected: Expected; findingKey: string; reason: string }
  | { type: 'remove_waiver'; expected: Expected; findingKey: string }
  | { type: 'approve'; expected: Expected; note?: string }
  | { type: 'request_changes'; expected: Expected; note: string }
  | { type: 'reject'; expected: Expected; reason: string }
  | { type: 'withdraw'; expected: Expected; note?: string };

export type ReviewActionType = ReviewAction['type'] | 'submit' | 'resubmit';

export interface AuditEvent {
  /** null for the event that creates a submission. */
  from: SubmissionState | null;
  to: SubmissionState;
  action: ReviewActionType;
  actorId: string;
  note: string | null;
}

export type ReviewRefusalCode =
  | 'forbidden_role'
  | 'not_builder'
  | 'own_submission'
  | 'not_assigned_steward'
  | 'conflict'
  | 'wrong_state'
  | 'already_claimed'
  | 'withdrawn'
  | 'note_required'
  | 'reason_required'
  | 'unresolved_findings'
  | 'unknown_finding'
  | 'not_waivable'
  | 'waiver_reason_required'
  | 'unknown_waiver'
  | 'already_resubmitted';

export interface ReviewRefusal {
  ok: false;
  code: ReviewRefusalCode;
  message: string;
  /** For conflict: what the submission is now. For unresolved_findings: the blocking finding keys. */
  details?: { state?: SubmissionState; version?: number; findingKeys?: string[] };
}

export interface ReviewResult {
  ok: true;
  submission: Submission;
  event: AuditEvent;
}

export { NOTE_MIN, NOTE_MAX };

// The words live with the other review words (contracts/verdict-words.ts), so refusals and screens agree.
const STATE_WORDS = SUBMISSION_STATE_IN_SENTENCE;

const refuse = (
  code: ReviewRefusalCode,
  message: string,
  details?: ReviewRefusal['details'],
): ReviewRefusal => (details ? { ok: false, code, message, details } : { ok: false, code, message });

const STEWARD_ACTIONS: ReadonlySet<ReviewAction['type']> = new Set([
  'claim',
  'waive',
  'remove_waiver',
  'approve',
  'request_changes',
  'reject',
]);

/** A written note of sensible length; undefined when it is fine, else the refusal. */
function noteProblem(
  text: string | undefined,
  code: 'note_required' | 'reason_required' | 'waiver_reason_required',
  what: string,
  min = NOTE_MIN,
  max = NOTE_MAX,
): ReviewRefusal | undefined {
  const t = (text ?? '').trim();
  if (t.length < min) return refuse(code, `${what} (at least ${min} characters).`);
  if (t.length > max) return refuse(code, `${what}, in at most ${max} characters.`);
  return undefined;
}

const optionalNote = (text: string | undefined): string | null => {
  const t = (text ?? '').trim();
  return t === '' ? null : t.slice(0, NOTE_MAX);
};

export function applyReviewAction(
  submission: Submission,
  action: ReviewAction,
  actor: ReviewActor,
): ReviewResult | ReviewRefusal {
  const s = submission;
  const isSteward = actor.roles.includes('steward');
  // Who may act at all comes first: it does not depend on what happened meanwhile.
  if (STEWARD_ACTIONS.has(action.type)) {
    if (!isSteward) return refuse('forbidden_role', 'Only a steward of this club can do that.');
    if (actor.id === s.builderId)
      return refuse('own_submission', 'A steward cannot review their own submission; another steward must.');
  }
  if (action.type === 'release' && !isSteward && !actor.roles.includes('admin'))
    return refuse('forbidden_role', 'Only a steward or a club admin can release a claim.');
  if (action.type === 'withdraw' && actor.id !== s.builderId)
    return refuse('not_builder', 'Only the builder who submitted it can withdraw a submission.');

  if (action.expected.version !== s.version || action.expected.state !== s.state) {
    return refuse(
      'conflict',
      `The submission changed meanwhile: it is now ${STATE_WORDS[s.state]}. Reload it and decide again.`,
      { state: s.state, version: s.version },
    );
  }
  if (s.state === 'withdrawn')
    return refuse('withdrawn', 'The builder withdrew this submission; there is nothing left to decide.');

  const next = (to: SubmissionState, patch: Partial<Submission>, note: string | null): ReviewResult => ({
    ok: true,
    submission: { ...s, ...patch, state: to, version: s.version + 1 },
    event: { from: s.state, to, action: action.type, actorId: actor.id, note },
  });
  const mustBeInReviewBy = (): ReviewRefusal | undefined => {
    if (s.state === 'pending') return refuse('wrong_state', 'Claim the submission before deciding on it.');
    if (s.state !== 'in_review')
      return refuse('wrong_state', `The submission is already ${STATE_WORDS[s.state]}.`);
    if (s.assignedStewardId !== actor.id)
      return refuse(
        'not_assigned_steward',
        'Another steward has claimed this submission; only they can decide on it.',
      );
    return undefined;
  };

  switch (action.type) {
    case 'claim':
      if (s.state === 'in_review')
        return refuse(
          'already_claimed',
          s.assignedStewardId === actor.id
            ? 'You have already claimed this submission.'
            : 'Another steward has already claimed this submission.',
        );
      if (s.state !== 'pending')
        return refuse('wrong_state', `The submission is already ${STATE_WORDS[s.state]}.`);
      return next('in_review', { assignedStewardId: actor.id }, null);
    case 'release': {
      // A request for changes keeps its steward: the resubmission comes back to them (see `resubmit`)
      // unless they let it go to the whole queue, which is this same release, before the builder answers.
      const returning = s.state === 'changes_requested' && !s.resubmittedAsId && s.assignedStewardId !== null;
      if (s.state !== 'in_review' && !returning)
        return refuse(
          'wrong_state',
          s.state === 'changes_requested'
            ? s.resubmittedAsId
              ? 'The builder has already resubmitted; release the newer submission instead.'
              : 'The resubmission of this submission already goes to every steward.'
            : `Only a claimed submission can be released; this one is ${STATE_WORDS[s.state]}.`,
        );
      // An admin may free a claim its steward left behind; a steward only their own.
      if (s.assignedStewardId !== actor.id && !actor.roles.includes('admin'))
        return refuse(
          'not_assigned_steward',
          'Only the steward who claimed it (or a club admin) can release it.',
        );
      return next(returning ? 'changes_requested' : 'pending', { assignedStewardId: null }, optionalNote(action.note));
    }
    case 'waive': {
      const problem = mustBeInReviewBy();
      if (problem) return problem;
      const finding = s.findings.find((f) => findingKey(f) === action.findingKey);
      if (!finding) return refuse('unknown_finding', 'That finding is not in this submission’s report.');
      if (!WAIVABLE_VERDICTS.includes(finding.verdict))
        return refuse('not_waivable', 'Only a finding that failed or lacks information can be waived.');
      const bad = noteProblem(
        action.reason,
        'waiver_reason_required',
        'Give the reason for the waiver',
        WAIVER_REASON_MIN,
        WAIVER_REASON_MAX,
      );
      if (bad) return bad;
      const waiver: Waiver = {
        findingKey: action.findingKey,
        reason: action.reason.trim(),
        stewardId: actor.id,
      };
      const waivers = [...s.waivers.filter((w) => w.findingKey !== action.findingKey), waiver];
      return next('in_review', { waivers }, `Waived ${action.findingKey}: ${waiver.reason}`);
    }
    case 'remove_waiver': {
      const problem = mustBeInReviewBy();
      if (problem) return problem;
      if (!s.waivers.some((w) => w.findingKey === action.findingKey))
        return refuse('unknown_waiver', 'There is no waiver on that finding.');
      return next(
        'in_review',
        { waivers: s.waivers.filter((w) => w.findingKey !== action.findingKey) },
        `Waiver removed from ${action.findingKey}`,
      );
    }
    case 'approve': {
      const problem = mustBeInReviewBy();
      if (problem) return problem;
      const overall = overallWithWaivers(s.findings, s.waivers);
      if (overall.verdict === 'fail' || overall.verdict === 'needs_information') {
        const n = overall.blocking.length;
        return refuse(
          'unresolved_findings',
          `${n} mandatory finding${n === 1 ? '' : 's'} did not pass and ${n === 1 ? 'is' : 'are'} not waived: waive ${n === 1 ? 'it' : 'them'} with a reason, or request changes.`,
          { findingKeys: overall.blocking },
        );
      }
      const note = optionalNote(action.note);
      return next('approved', { decisionNote: note }, note);
    }
    case 'request_changes': {
      const problem =
        mustBeInReviewBy() ?? noteProblem(action.note, 'note_required', 'Say what the builder should change');
      if (problem) return problem;
      return next('changes_requested', { decisionNote: action.note.trim() }, action.note.trim());
    }
    case 'reject': {
      const problem =
        mustBeInReviewBy() ??
        noteProblem(action.reason, 'reason_required', 'Give the reason for the rejection');
      if (problem) return problem;
      return next('rejected', { decisionNote: action.reason.trim() }, action.reason.trim());
    }
    case 'withdraw':
      if (s.state !== 'pending' && s.state !== 'in_review')
        return refuse(
          'wrong_state',
          `A submission that is ${STATE_WORDS[s.state]} can no longer be withdrawn.`,
        );
      return next('withdrawn', {}, optionalNote(action.note));
  }
}

export interface NewSubmissionInput {
  id: string;
  checkRunId: string;
  /** Who saved the check run; only they may submit it. */
  checkRunOwnerId: string;
  findings: readonly ReviewFinding[];
}

/** A builder submits one of their saved check runs for review. */
export function submitForReview(input: NewSubmissionInput, actor: ReviewActor): ReviewResult | ReviewRefusal {
  if (!actor.roles.includes('builder'))
    return refuse('forbidden_role', 'Only a builder of this club can submit a check for review.');
  if (input.checkRunOwnerId !== actor.id)
    return refuse('not_builder', 'Only the builder who saved this check can submit it.');
  return {
    ok: true,
    submission: fresh(input, actor.id, null),
    event: { from: null, to: 'pending', action: 'submit', actorId: actor.id, note: null },
  };
}

function fresh(
  input: NewSubmissionInput,
  builderId: string,
  previousSubmissionId: string | null,
): Submission {
  return {
    id: input.id,
    state: 'pending',
    version: 1,
    builderId,
    checkRunId: input.checkRunId,
    assignedStewardId: null,
    previousSubmissionId,
    resubmittedAsId: null,
    findings: input.findings,
    waivers: [],
    decisionNote: null,
  };
}

export interface ResubmitResult {
  ok: true;
  /** The returned submission, now pointing at its successor (its state stays changes_requested). */
  previous: Submission;
  submission: Submission;
  events: { previous: AuditEvent; submission: AuditEvent };
}

/**
 * After changes were requested the builder submits a new check run as a new submission linked to
 * the old one. Waivers are not carried over: the new report is a new set of findings. The new one goes
 * back to the steward who asked for the changes, already claimed by them (`in_review`), when
 * `returnTo` names them: the caller passes the previous submission's steward while they still hold the
 * steward role in the club and did not release it. Otherwise it waits in the queue (`pending`).
 */
export function resubmit(
  previous: Submission,
  input: NewSubmissionInput,
  actor: ReviewActor,
  expected: Expected,
  returnTo: string | null = null,
): ResubmitResult | ReviewRefusal {
  if (actor.id !== previous.builderId)
    return refuse('not_builder', 'Only the builder who submitted it can resubmit.');
  if (input.checkRunOwnerId !== actor.id)
    return refuse('not_builder', 'Only the builder who saved this check can submit it.');
  if (expected.version !== previous.version || expected.state !== previous.state) {
    return refuse('conflict', `The submission changed meanwhile: it is now ${STATE_WORDS[previous.state]}.`, {
      state: previous.state,
      version: previous.version,
    });
  }
  if (previous.state !== 'changes_requested')
    return refuse(
      'wrong_state',
      `Only a submission returned for changes can be resubmitted; this one is ${STATE_WORDS[previous.state]}.`,
    );
  if (previous.resubmittedAsId)
    return refuse(
      'already_resubmitted',
      'This submission has already been resubmitted; follow the newer one.',
    );
  const back = returnTo !== null && returnTo !== actor.id ? returnTo : null;
  const submission: Submission = back
    ? { ...fresh(input, actor.id, previous.id), state: 'in_review', assignedStewardId: back }
    : fresh(input, actor.id, previous.id);
  return {
    ok: true,
    previous: { ...previous, resubmittedAsId: input.id, version: previous.version + 1 },
    submission,
    events: {
      previous: {
        from: 'changes_requested',
        to: 'changes_requested',
        action: 'resubmit',
        actorId: actor.id,
        note: `Resubmitted as ${input.id}`,
      },
      submission: {
        from: null,
        to: submission.state,
        action: 'resubmit',
        actorId: actor.id,
        note: back
          ? `Resubmission of ${previous.id}, back with the steward who asked for the changes`
          : `Resubmission of ${previous.id}`,
      },
    },
  };
}

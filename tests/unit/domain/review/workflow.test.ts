// Review workflow: every action from every state, the roles that must be refused, conflicts from
// stale clients, notes and reasons, waivers and approval, and resubmission after changes.
import { describe, expect, test } from 'vitest';
import {
  SUBMISSION_STATES,
  applyReviewAction,
  resubmit,
  submitForReview,
} from '@backend/domain/review/workflow';
import type { ReviewAction, ReviewActor, Submission, SubmissionState } from '@backend/domain/review/workflow';
import type { ReviewFinding } from '@backend/domain/review/waivers';

const BUILDER: ReviewActor = { id: 'u-builder', roles: ['builder'] };
const STEWARD: ReviewActor = { id: 'u-steward', roles: ['steward'] };
const OTHER_STEWARD: ReviewActor = { id: 'u-steward-2', roles: ['steward'] };
const ADMIN: ReviewActor = { id: 'u-admin', roles: ['admin'] };
const BUILDER_STEWARD: ReviewActor = { id: 'u-builder', roles: ['builder', 'steward'] };

const passing: ReviewFinding[] = [
  { requirementId: 'tv-cage-members', verdict: 'pass', severity: 'mandatory', member: null, plate: null },
  { requirementId: 'tv-padding', verdict: 'fail', severity: 'advisory', member: null, plate: null },
];
const failing: ReviewFinding[] = [
  ...passing,
  {
    requirementId: 'tv-saloon-tubes',
    verdict: 'fail',
    severity: 'mandatory',
    member: { id: 'm-main' },
    plate: null,
  },
  {
    requirementId: 'tv-inspection-hole',
    verdict: 'needs_information',
    severity: 'mandatory',
    member: { id: 'm-main' },
    plate: null,
  },
];

function sub(state: SubmissionState, over: Partial<Submission> = {}): Submission {
  const claimed = state === 'pending' ? null : STEWARD.id;
  return {
    id: 's1',
    state,
    version: 3,
    builderId: BUILDER.id,
    checkRunId: 'run1',
    assignedStewardId: claimed,
    previousSubmissionId: null,
    resubmittedAsId: null,
    findings: passing,
    waivers: [],
    decisionNote: null,
    ...over,
  };
}

const NOTE = 'Replace the door bars with 1.500 × 0.095 in DOM.';
const actionFor = (type: ReviewAction['type'], state: SubmissionState, version = 3): ReviewAction => {
  const expected = { state, version };
  switch (type) {
    case 'request_changes':
      return { type, expected, note: NOTE };
    case 'reject':
      return { type, expected, reason: 'The car is a different chassis from the one described.' };
    case 'waive':
      return {
        type,
        expected,
        findingKey: 'tv-padding@vehicle',
        reason: 'Padding fitted and seen at the bench.',
      };
    case 'remove_waiver':
      return { type, expected, findingKey: 'tv-padding@vehicle' };
    default:
      return { type, expected } as ReviewAction;
  }
};

describe('every action from every state (right actor, fresh client)', () => {
  // [action, actor] → states it is allowed from and the state it leads to ('same' = unchanged).
  const table: [ReviewAction['type'], ReviewActor, Partial<Record<SubmissionState, SubmissionState>>][] = [
    ['claim', OTHER_STEWARD, { pending: 'in_review' }],
    // Releasing a request for changes lets its resubmission go to every steward; its state stays.
    ['release', STEWARD, { in_review: 'pending', changes_requested: 'changes_requested' }],
    ['approve', STEWARD, { in_review: 'approved' }],
    ['request_changes', STEWARD, { in_review: 'changes_requested' }],
    ['reject', STEWARD, { in_review: 'rejected' }],
    ['withdraw', BUILDER, { pending: 'withdrawn', in_review: 'withdrawn' }],
  ];
  const rows = table.flatMap(([type, actor, allowed]) =>
    SUBMISSION_STATES.map((state) => [type, state, actor, allowed[state] ?? null] as const),
  );
  test.each(rows)('%s from %s', (type, state, actor, to) => {
    const r = applyReviewAction(sub(state), actionFor(type, state), actor);
    if (to === null) {
      expect(r.ok).toBe(false);
      if (!r.ok) expect(['wrong_state', 'withdrawn', 'already_claimed']).toContain(r.code);
      return;
    }
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.submission.state).toBe(to);
    expect(r.submission.version).toBe(4);
    expect(r.event).toMatchObject({ from: state, to, action: type, actorId: actor.id });
  });
});

describe('refusals', () => {
  test.each<[string, Submission, ReviewAction, ReviewActor, string]>([
    ['a builder cannot claim', sub('pending'), actionFor('claim', 'pending'), BUILDER, 'forbidden_role'],
    [
      'an admin without the steward role cannot approve',
      sub('in_review'),
      actionFor('approve', 'in_review'),
      ADMIN,
      'forbidden_role',
    ],
    [
      'a builder cannot release',
      sub('in_review'),
      actionFor('release', 'in_review'),
      BUILDER,
      'forbidden_role',
    ],
    [
      'a steward cannot review their own submission',
      sub('pending'),
      actionFor('claim', 'pending'),
      BUILDER_STEWARD,
      'own_submission',
    ],
    [
      'a steward cannot withdraw for the builder',
      sub('pending'),
      actionFor('withdraw', 'pending'),
      STEWARD,
      'not_builder',
    ],
    [
      'another steward cannot approve a claimed submission',
      sub('in_review'),
      actionFor('approve', 'in_review'),
      OTHER_STEWARD,
      'not_assigned_steward',
    ],
    [
      'another steward cannot release it',
      sub('in_review'),
      actionFor('release', 'in_review'),
      OTHER_STEWARD,
      'not_assigned_steward',
    ],
    [
      'claiming a claimed submission',
      sub('in_review'),
      actionFor('claim', 'in_review'),
      OTHER_STEWARD,
      'already_claimed',
    ],
    ['approving before claiming', sub('pending'), actionFor('approve', 'pending'), STEWARD, 'wrong_state'],
    [
      'a withdrawn submission cannot be approved',
      sub('withdrawn'),
      actionFor('approve', 'withdrawn'),
      STEWARD,
      'withdrawn',
    ],
    [
      'a withdrawn submission cannot be claimed',
      sub('withdrawn'),
      actionFor('claim', 'withdrawn'),
      OTHER_STEWARD,
      'withdrawn',
    ],
    [
      'an approved submission cannot be withdrawn',
      sub('approved'),
      actionFor('withdraw', 'approved'),
      BUILDER,
      'wrong_state',
    ],
    [
      'request changes without a note',
      sub('in_review'),
      { type: 'request_changes', expected: { state: 'in_review', version: 3 }, note: '   ' },
      STEWARD,
      'note_required',
    ],
    [
      'request changes with a note too short to say anything',
      sub('in_review'),
      { type: 'request_changes', expected: { state: 'in_review', version: 3 }, note: 'fix it' },
      STEWARD,
      'note_required',
    ],
    [
      'request changes with a note of 4,001 characters',
      sub('in_review'),
      { type: 'request_changes', expected: { state: 'in_review', version: 3 }, note: 'x'.repeat(4001) },
      STEWARD,
      'note_required',
    ],
    [
      'reject without a reason',
      sub('in_review'),
      { type: 'reject', expected: { state: 'in_review', version: 3 }, reason: '' },
      STEWARD,
      'reason_required',
    ],
    [
      'approve with an unwaived mandatory fail',
      sub('in_review', { findings: failing }),
      actionFor('approve', 'in_review'),
      STEWARD,
      'unresolved_findings',
    ],
    [
      'waive a finding that is not in the report',
      sub('in_review'),
      {
        type: 'waive',
        expected: { state: 'in_review', version: 3 },
        findingKey: 'nope@vehicle',
        reason: 'Seen at the bench.',
      },
      STEWARD,
      'unknown_finding',
    ],
    [
      'waive a passing finding',
      sub('in_review'),
      {
        type: 'waive',
        expected: { state: 'in_review', version: 3 },
        findingKey: 'tv-cage-members@vehicle',
        reason: 'Seen at the bench.',
      },
      STEWARD,
      'not_waivable',
    ],
    [
      'waive without a reason',
      sub('in_review', { findings: failing }),
      {
        type: 'waive',
        expected: { state: 'in_review', version: 3 },
        findingKey: 'tv-saloon-tubes@member:m-main',
        reason: ' ',
      },
      STEWARD,
      'waiver_reason_required',
    ],
    [
      'remove a waiver that does not exist',
      sub('in_review'),
      actionFor('remove_waiver', 'in_review'),
      STEWARD,
      'unknown_waiver',
    ],
    [
      'waive as another steward',
      sub('in_review', { findings: failing }),
      actionFor('waive', 'in_review'),
      OTHER_STEWARD,
      'not_assigned_steward',
    ],
  ])('%s', (_name, submission, action, actor, code) => {
    const r = applyReviewAction(submission, action, actor);
    expect(r).toMatchObject({ ok: false, code });
    if (!r.ok) expect(r.message).toMatch(/\w{3,}/);
  });

  test('the blocking findings are listed', () => {
    const r = applyReviewAction(
      sub('in_review', { findings: failing }),
      actionFor('approve', 'in_review'),
      STEWARD,
    );
    expect(!r.ok && r.details?.findingKeys).toEqual([
      'tv-saloon-tubes@member:m-main',
      'tv-inspection-hole@member:m-main',
    ]);
  });
});

describe('conflicts: the client decides on what it saw', () => {
  test.each<[string, Submission, ReviewAction, ReviewActor]>([
    [
      'another steward claimed it meanwhile',
      sub('in_review', { assignedStewardId: OTHER_STEWARD.id, version: 4 }),
      actionFor('claim', 'pending', 3),
      STEWARD,
    ],
    [
      'the builder withdrew it meanwhile',
      sub('withdrawn', { version: 4 }),
      actionFor('approve', 'in_review', 3),
      STEWARD,
    ],
    [
      'same state, newer version (a waiver was added)',
      sub('in_review', { version: 5 }),
      actionFor('approve', 'in_review', 4),
      STEWARD,
    ],
    [
      'the builder withdraws what was just approved',
      sub('approved', { version: 4 }),
      actionFor('withdraw', 'in_review', 3),
      BUILDER,
    ],
  ])('%s', (_name, submission, action, actor) => {
    const r = applyReviewAction(submission, action, actor);
    expect(r).toMatchObject({
      ok: false,
      code: 'conflict',
      details: { state: submission.state, version: submission.version },
    });
  });

  test('a wrong role is reported as such even from a stale client', () => {
    expect(
      applyReviewAction(sub('approved', { version: 9 }), actionFor('approve', 'in_review', 3), BUILDER),
    ).toMatchObject({ code: 'forbidden_role' });
  });
});

describe('decisions and their audit events', () => {
  test('claim records the steward', () => {
    const r = applyReviewAction(sub('pending'), actionFor('claim', 'pending'), STEWARD);
    expect(r.ok && r.submission.assignedStewardId).toBe(STEWARD.id);
    expect(r.ok && r.event).toEqual({
      from: 'pending',
      to: 'in_review',
      action: 'claim',
      actorId: STEWARD.id,
      note: null,
    });
  });

  test('release clears the claim; an admin may release a claim left behind', () => {
    const r = applyReviewAction(
      sub('in_review'),
      { type: 'release', expected: { state: 'in_review', version: 3 }, note: 'On holiday until the 20th.' },
      ADMIN,
    );
    expect(r.ok && r.submission).toMatchObject({ state: 'pending', assignedStewardId: null });
    expect(r.ok && r.event.note).toBe('On holiday until the 20th.');
  });

  test('request changes keeps the note on the submission and in the event', () => {
    const r = applyReviewAction(
      sub('in_review'),
      { type: 'request_changes', expected: { state: 'in_review', version: 3 }, note: `  ${NOTE}  ` },
      STEWARD,
    );
    expect(r.ok && r.submission.decisionNote).toBe(NOTE);
    expect(r.ok && r.event).toEqual({
      from: 'in_review',
      to: 'changes_requested',
      action: 'request_changes',
      actorId: STEWARD.id,
      note: NOTE,
    });
  });

  test('reject records its reason', () => {
    const r = applyReviewAction(sub('in_review'), actionFor('reject', 'in_review'), STEWARD);
    expect(r.ok && r.event.note).toBe('The car is a different chassis from the one described.');
  });

  test('waive both blocking findings, then approve: the version moves at every step', () => {
    let s = sub('in_review', { findings: failing });
    for (const [key, reason] of [
      ['tv-saloon-tubes@member:m-main', 'Wall measured 0.120 in by ultrasonic gauge at three places.'],
      ['tv-inspection-hole@member:m-main', 'Wall measured by ultrasonic gauge instead of a hole.'],
    ]) {
      const r = applyReviewAction(
        s,
        { type: 'waive', expected: { state: s.state, version: s.version }, findingKey: key, reason },
        STEWARD,
      );
      if (!r.ok) throw new Error(r.message);
      expect(r.event).toMatchObject({
        from: 'in_review',
        to: 'in_review',
        action: 'waive',
        note: `Waived ${key}: ${reason}`,
      });
      s = r.submission;
    }
    expect(s.version).toBe(5);
    expect(s.waivers.map((w) => w.stewardId)).toEqual([STEWARD.id, STEWARD.id]);
    const approved = applyReviewAction(
      s,
      { type: 'approve', expected: { state: 'in_review', version: 5 } },
      STEWARD,
    );
    expect(approved.ok && approved.submission).toMatchObject({ state: 'approved', version: 6 });
  });

  test('waiving the same finding again replaces the reason; removing it blocks approval again', () => {
    const base = sub('in_review', {
      findings: failing.slice(0, 3),
      waivers: [
        { findingKey: 'tv-saloon-tubes@member:m-main', reason: 'First reason given.', stewardId: STEWARD.id },
      ],
    });
    const again = applyReviewAction(
      base,
      {
        type: 'waive',
        expected: { state: 'in_review', version: 3 },
        findingKey: 'tv-saloon-tubes@member:m-main',
        reason: 'A better reason given.',
      },
      STEWARD,
    );
    expect(again.ok && again.submission.waivers).toEqual([
      {
        findingKey: 'tv-saloon-tubes@member:m-main',
        reason: 'A better reason given.',
        stewardId: STEWARD.id,
      },
    ]);
    const removed = applyReviewAction(
      base,
      {
        type: 'remove_waiver',
        expected: { state: 'in_review', version: 3 },
        findingKey: 'tv-saloon-tubes@member:m-main',
      },
      STEWARD,
    );
    if (!removed.ok) throw new Error(removed.message);
    expect(
      applyReviewAction(
        removed.submission,
        { type: 'approve', expected: { state: 'in_review', version: 4 } },
        STEWARD,
      ),
    ).toMatchObject({ code: 'unresolved_findings' });
  });

  test('the input submission is never changed', () => {
    const s = sub('pending');
    const copy = structuredClone(s);
    applyReviewAction(s, actionFor('claim', 'pending'), STEWARD);
    expect(s).toEqual(copy);
  });
});

describe('submitting and resubmitting', () => {
  test('a builder submits their own check run', () => {
    const r = submitForReview(
      { id: 's1', checkRunId: 'run1', checkRunOwnerId: BUILDER.id, findings: passing },
      BUILDER,
    );
    expect(r.ok && r.submission).toMatchObject({
      state: 'pending',
      version: 1,
      builderId: BUILDER.id,
      assignedStewardId: null,
      previousSubmissionId: null,
    });
    expect(r.ok && r.event).toEqual({
      from: null,
      to: 'pending',
      action: 'submit',
      actorId: BUILDER.id,
      note: null,
    });
  });

  test.each<[string, ReviewActor, string, string]>([
    ['someone else’s check run', BUILDER, 'u-other', 'not_builder'],
    ['without the builder role', STEWARD, STEWARD.id, 'forbidden_role'],
  ])('refused: %s', (_n, actor, owner, code) => {
    expect(
      submitForReview({ id: 's1', checkRunId: 'run1', checkRunOwnerId: owner, findings: passing }, actor),
    ).toMatchObject({ ok: false, code });
  });

  const input = { id: 's2', checkRunId: 'run2', checkRunOwnerId: BUILDER.id, findings: passing };

  test('after changes were requested, a new submission linked both ways', () => {
    const previous = sub('changes_requested', { decisionNote: NOTE });
    const r = resubmit(previous, input, BUILDER, { state: 'changes_requested', version: 3 });
    if (!r.ok) throw new Error(r.message);
    expect(r.previous).toMatchObject({ state: 'changes_requested', resubmittedAsId: 's2', version: 4 });
    expect(r.submission).toMatchObject({
      id: 's2',
      state: 'pending',
      version: 1,
      previousSubmissionId: 's1',
      checkRunId: 'run2',
      waivers: [],
    });
    expect(r.events.submission).toEqual({
      from: null,
      to: 'pending',
      action: 'resubmit',
      actorId: BUILDER.id,
      note: 'Resubmission of s1',
    });
  });

  test('the resubmission goes back to the steward who asked, already claimed by them', () => {
    const previous = sub('changes_requested', { decisionNote: NOTE });
    const r = resubmit(previous, input, BUILDER, { state: 'changes_requested', version: 3 }, STEWARD.id);
    if (!r.ok) throw new Error(r.message);
    expect(r.submission).toMatchObject({ state: 'in_review', assignedStewardId: STEWARD.id, previousSubmissionId: 's1' });
    expect(r.events.submission).toMatchObject({ from: null, to: 'in_review', note: 'Resubmission of s1, back with the steward who asked for the changes' });
    // Never back to the builder themself (a builder who is also a steward of the club).
    const own = resubmit(previous, input, BUILDER, { state: 'changes_requested', version: 3 }, BUILDER.id);
    expect(own.ok && own.submission).toMatchObject({ state: 'pending', assignedStewardId: null });
  });

  test('a released request for changes keeps its state and lets go of its steward', () => {
    const r = applyReviewAction(sub('changes_requested'), { type: 'release', expected: { state: 'changes_requested', version: 3 } }, STEWARD);
    expect(r.ok && r.submission).toMatchObject({ state: 'changes_requested', assignedStewardId: null, version: 4 });
    expect(applyReviewAction(sub('changes_requested'), { type: 'release', expected: { state: 'changes_requested', version: 3 } }, OTHER_STEWARD)).toMatchObject({ ok: false, code: 'not_assigned_steward' });
    expect(applyReviewAction(sub('changes_requested', { assignedStewardId: null }), { type: 'release', expected: { state: 'changes_requested', version: 3 } }, STEWARD)).toMatchObject({ ok: false, code: 'wrong_state' });
    expect(applyReviewAction(sub('changes_requested', { resubmittedAsId: 's9' }), { type: 'release', expected: { state: 'changes_requested', version: 3 } }, STEWARD)).toMatchObject({ ok: false, code: 'wrong_state' });
  });

  test.each<[string, Submission, ReviewActor, number, string]>([
    ['a rejected submission', sub('rejected'), BUILDER, 3, 'wrong_state'],
    ['a pending submission', sub('pending'), BUILDER, 3, 'wrong_state'],
    ['twice', sub('changes_requested', { resubmittedAsId: 's9' }), BUILDER, 3, 'already_resubmitted'],
    ['by someone else', sub('changes_requested'), OTHER_STEWARD, 3, 'not_builder'],
    ['from a stale page', sub('changes_requested', { version: 4 }), BUILDER, 3, 'conflict'],
  ])('resubmit refused: %s', (_n, previous, actor, version, code) => {
    expect(resubmit(previous, input, actor, { state: previous.state, version })).toMatchObject({
      ok: false,
      code,
    });
  });
});

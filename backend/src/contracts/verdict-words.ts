// The words for verdicts and review outcomes, in one place that the server (PDF reports, e-mails) and
// the client (every screen) read, so "Approved with 1 waiver" reads the same wherever a cage shows.
// Plain data and small pure functions: no zod, no domain imports, safe for both sides.

export type CheckVerdictKey = 'pass' | 'fail' | 'needs_information';
export type FindingVerdictKey = CheckVerdictKey | 'not_applicable';
export type ShownFindingKey = FindingVerdictKey | 'waived';
export type ReviewVerdictKey = CheckVerdictKey | 'pass_with_waivers';
export type SubmissionStateKey = 'pending' | 'in_review' | 'approved' | 'changes_requested' | 'rejected' | 'withdrawn';

/** The overall verdict of one pre-check (a check run, or the live check of a sheet). */
export const CHECK_VERDICT_WORDS: Readonly<Record<CheckVerdictKey, { short: string; outcome: string; sentence: string; banner: string; summary: string }>> = {
  pass: { short: 'Pre-check met', outcome: 'met', sentence: 'meets the rules', banner: 'PASSES THE PRE-CHECK', summary: 'Every mandatory rule is met' },
  fail: { short: 'Pre-check not met', outcome: 'not met', sentence: 'does not meet the rules', banner: 'DOES NOT PASS THE PRE-CHECK', summary: 'Some mandatory rules are not met' },
  needs_information: { short: 'Needs measurements', outcome: 'needs measurements', sentence: 'needs more measurements', banner: 'NEEDS MORE INFORMATION', summary: 'More measurements needed to decide' },
};

/** One finding's verdict; "waived" is a steward's written acceptance, never a pass. */
export const FINDING_VERDICT_WORDS: Readonly<Record<ShownFindingKey, string>> = {
  pass: 'Meets the rule',
  fail: 'Does not meet it',
  needs_information: 'Needs a measurement',
  not_applicable: 'Does not apply',
  waived: 'Waived',
};

/** "1 waiver", "3 waivers". */
export function waiverCountText(count: number): string {
  return `${count} waiver${count === 1 ? '' : 's'}`;
}

/** The verdict of a submitted check with the steward's waivers counted (domain/review/waivers.ts). */
export function reviewVerdictText(verdict: ReviewVerdictKey, waivedCount: number): string {
  switch (verdict) {
    case 'pass':
      return 'Meets every mandatory rule';
    case 'pass_with_waivers':
      return `Meets the rules with ${waiverCountText(waivedCount)}`;
    case 'fail':
      return 'Mandatory rules not met';
    case 'needs_information':
      return 'Measurements missing';
  }
}

/** A submission's state as the builder and the steward read it. */
export const SUBMISSION_STATE_WORDS: Readonly<Record<SubmissionStateKey, string>> = {
  pending: 'Waiting for a steward',
  in_review: 'In review',
  approved: 'Approved',
  changes_requested: 'Changes requested',
  rejected: 'Rejected',
  withdrawn: 'Withdrawn',
};

/** A submission's state inside a sentence: "The submission is already approved", "it is now in review". */
export const SUBMISSION_STATE_IN_SENTENCE: Readonly<Record<SubmissionStateKey, string>> = {
  pending: 'waiting for a steward',
  in_review: 'in review',
  approved: 'approved',
  changes_requested: 'returned for changes',
  rejected: 'rejected',
  withdrawn: 'withdrawn',
};

/** "Approved", "Approved with 1 waiver". */
export function approvedText(waivedCount: number): string {
  return waivedCount > 0 ? `Approved with ${waiverCountText(waivedCount)}` : 'Approved';
}

/**
 * The one line that names where a submission stands: an approval counts its waivers, and a request
 * for changes the builder has answered with a resubmission no longer reads as open.
 */
export function submissionStateText(state: SubmissionStateKey, options: { waivedCount?: number; resubmitted?: boolean } = {}): string {
  if (state === 'approved') return approvedText(options.waivedCount ?? 0);
  if (state === 'changes_requested' && options.resubmitted) return 'Changes made and resubmitted';
  return SUBMISSION_STATE_WORDS[state];
}

/** Short words for the builder's overview: where the sheet's latest submission stands. */
export const SUBMISSION_STATE_SHORT: Readonly<Record<SubmissionStateKey, string>> = {
  pending: 'Sent for review',
  in_review: 'Being reviewed',
  approved: 'Approved',
  changes_requested: 'Changes asked',
  rejected: 'Rejected',
  withdrawn: 'Withdrawn',
};

/** The e-mail subject's word for a steward's decision. */
export function decisionSubjectText(decision: 'approve' | 'request_changes' | 'reject', waivedCount: number): string {
  if (decision === 'approve') return approvedText(waivedCount).toLowerCase();
  return decision === 'request_changes' ? 'changes requested' : 'rejected';
}

// Words for the review's states, actions and record statuses for every review screen. The state and
// verdict words are the server's too (contracts/verdict-words.ts): the PDF and the mail say the same.
import type { RecordStatus, SubmissionState } from '@/api/review';
import { SUBMISSION_STATE_WORDS, submissionStateText } from '@contracts/verdict-words';
import { RECORD_STATUS_WORDS } from '@contracts/record-words';

export { approvedText, reviewVerdictText, submissionStateText, SUBMISSION_STATE_SHORT } from '@contracts/verdict-words';

export const STATE_LABELS: Readonly<Record<SubmissionState, string>> = SUBMISSION_STATE_WORDS;

export const STATE_SEVERITY: Readonly<Record<SubmissionState, 'info' | 'warn' | 'success' | 'danger' | 'secondary'>> = {
  pending: 'info',
  in_review: 'warn',
  approved: 'success',
  changes_requested: 'warn',
  rejected: 'danger',
  withdrawn: 'secondary',
};

/** A submission's state as a tag: approvals count their waivers; an answered request for changes is not open. */
export function stateTag(state: SubmissionState, options: { waivedCount?: number; resubmitted?: boolean } = {}): { label: string; severity: (typeof STATE_SEVERITY)[SubmissionState] } {
  const label = submissionStateText(state, options);
  return { label, severity: state === 'changes_requested' && options.resubmitted ? 'secondary' : STATE_SEVERITY[state] };
}

export const ACTION_LABELS: Readonly<Record<string, string>> = {
  submit: 'Submitted',
  resubmit: 'Resubmitted',
  claim: 'Claimed',
  release: 'Released the claim',
  waive: 'Waived a finding',
  remove_waiver: 'Removed a waiver',
  approve: 'Approved',
  request_changes: 'Asked for changes',
  reject: 'Rejected',
  withdraw: 'Withdrew',
};

/** The shared words (contracts/record-words.ts): the records page, a record's card and the mail agree. */
export const RECORD_STATUS_LABELS: Readonly<Record<RecordStatus, string>> = {
  valid: RECORD_STATUS_WORDS.valid.label,
  expired: RECORD_STATUS_WORDS.expired.label,
  superseded: RECORD_STATUS_WORDS.superseded.label,
  revoked: RECORD_STATUS_WORDS.revoked.label,
};

/** "3 days ago", "today": how long a submission has waited. */
export function ageText(iso: string, now = new Date()): string {
  const days = Math.floor((now.getTime() - new Date(iso).getTime()) / 86_400_000);
  if (days <= 0) return 'today';
  if (days === 1) return 'yesterday';
  return `${days} days ago`;
}

export const dateText = (iso: string) => new Date(iso).toLocaleDateString(undefined, { dateStyle: 'medium' });
export const dateTimeText = (iso: string) => new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });

/** The key the server gives a finding: the same pure function, so waivers and notes always match. */
export { findingKey as keyOf } from '@domain/review/waivers';

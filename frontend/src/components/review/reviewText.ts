// Words for the review's states, actions and record statuses, in one place for every review screen.
import type { RecordStatus, SubmissionState } from '@/api/review';

export const STATE_LABELS: Readonly<Record<SubmissionState, string>> = {
  pending: 'Waiting for a steward',
  in_review: 'In review',
  approved: 'Approved',
  changes_requested: 'Changes requested',
  rejected: 'Rejected',
  withdrawn: 'Withdrawn',
};

export const STATE_SEVERITY: Readonly<Record<SubmissionState, 'info' | 'warn' | 'success' | 'danger' | 'secondary'>> = {
  pending: 'info',
  in_review: 'warn',
  approved: 'success',
  changes_requested: 'warn',
  rejected: 'danger',
  withdrawn: 'secondary',
};

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

export const RECORD_STATUS_LABELS: Readonly<Record<RecordStatus, string>> = {
  valid: 'Valid',
  expired: 'Expired',
  superseded: 'Superseded by a newer record',
  revoked: 'Revoked',
};

export const OVERALL_REVIEW_LABELS = {
  pass: 'Meets every mandatory rule',
  pass_with_waivers: 'Meets the rules with waivers',
  fail: 'Mandatory rules not met',
  needs_information: 'Measurements missing',
} as const;

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

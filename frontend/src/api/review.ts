// Reviews, cage records and the public verification (docs/api.md, "Review and cage records"). Wire
// types come from the server's contract.
import { http } from './http';
import type {
  CageRecordWire, CheckRunVerificationWire, MySubmissionWire, QueueQuery, QueueWire, RecordSettingsWire, SubmissionDetailWire, VerificationWire,
} from '@contracts/review';

export type {
  AnnotationWire as Annotation, CageRecordWire as CageRecord, ChangesSinceWire as ChangesSince, HistoryItemWire as HistoryItem,
  MySubmissionWire as MySubmission, QueueItemWire as QueueItem, QueueQuery, QueueWire as Queue, RecordSettingsWire as RecordSettings,
  RecordStatusWire as RecordStatus, SubmissionDetailWire as SubmissionDetail, SubmissionStateWire as SubmissionState,
  VerificationWire as Verification, CheckRunVerificationWire as CheckRunVerification, WaiverWire as Waiver,
} from '@contracts/review';

/** What a code names: a cage record, or a check run (a pre-check of a date, not a record). */
export type CodeAnswer = { kind: 'cage_record'; record: VerificationWire } | { kind: 'check_run'; checkRun: CheckRunVerificationWire };

const id = encodeURIComponent;
export interface Expected {
  state: SubmissionDetailWire['state'];
  version: number;
}

export type ReviewActionInput =
  | { type: 'claim' }
  | { type: 'release'; note?: string }
  | { type: 'waive'; findingKey: string; reason: string }
  | { type: 'remove_waiver'; findingKey: string }
  | { type: 'approve'; note?: string }
  | { type: 'request_changes'; note: string }
  | { type: 'reject'; reason: string }
  | { type: 'withdraw'; note?: string };

export async function submitForReview(checkRunId: string, note: string): Promise<SubmissionDetailWire> {
  return (await http.post<{ submission: SubmissionDetailWire }>('/submissions', { checkRunId, ...(note.trim() ? { note } : {}) })).submission;
}

export async function resubmit(previousId: string, checkRunId: string, note: string, expected: Expected): Promise<SubmissionDetailWire> {
  return (await http.post<{ submission: SubmissionDetailWire }>(`/submissions/${id(previousId)}/resubmit`, { checkRunId, expected, ...(note.trim() ? { note } : {}) })).submission;
}

export async function mySubmissions(checkRunId?: string): Promise<MySubmissionWire[]> {
  return (await http.get<{ submissions: MySubmissionWire[] }>(`/submissions${checkRunId ? `?checkRunId=${id(checkRunId)}` : ''}`)).submissions;
}

export async function getSubmission(submissionId: string): Promise<SubmissionDetailWire> {
  return (await http.get<{ submission: SubmissionDetailWire }>(`/submissions/${id(submissionId)}`)).submission;
}

export async function actOnSubmission(submissionId: string, action: ReviewActionInput, expected: Expected): Promise<SubmissionDetailWire> {
  return (await http.post<{ submission: SubmissionDetailWire }>(`/submissions/${id(submissionId)}/actions`, { ...action, expected })).submission;
}

export async function annotateFinding(submissionId: string, findingKey: string, text: string): Promise<SubmissionDetailWire> {
  return (await http.post<{ submission: SubmissionDetailWire }>(`/submissions/${id(submissionId)}/annotations`, { findingKey, text })).submission;
}

export const submissionPdfUrl = (submissionId: string, units: string) => `/api/submissions/${id(submissionId)}/report.pdf?units=${units}`;

export function queueSearch(q: Partial<QueueQuery>): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined && v !== '') params.set(k, String(v));
  const s = params.toString();
  return s ? `?${s}` : '';
}

export function getQueue(clubId: string, q: Partial<QueueQuery>): Promise<QueueWire> {
  return http.get<QueueWire>(`/clubs/${id(clubId)}/submissions${queueSearch(q)}`);
}

export async function getReviewMail(clubId: string): Promise<boolean> {
  return (await http.get<{ enabled: boolean }>(`/clubs/${id(clubId)}/review-mail`)).enabled;
}

export async function setReviewMail(clubId: string, enabled: boolean): Promise<boolean> {
  return (await http.put<{ enabled: boolean }>(`/clubs/${id(clubId)}/review-mail`, { enabled })).enabled;
}

export async function getCageRecord(recordId: string): Promise<CageRecordWire> {
  return (await http.get<{ record: CageRecordWire }>(`/cage-records/${id(recordId)}`)).record;
}

export async function revokeCageRecord(recordId: string, reason: string): Promise<CageRecordWire> {
  return (await http.post<{ record: CageRecordWire }>(`/cage-records/${id(recordId)}/revoke`, { reason })).record;
}

export async function getRecordSettings(clubId: string): Promise<RecordSettingsWire> {
  return (await http.get<{ settings: RecordSettingsWire }>(`/clubs/${id(clubId)}/record-settings`)).settings;
}

export async function updateRecordSettings(clubId: string, body: { recordPrefix?: string; validityMonths?: number }): Promise<RecordSettingsWire> {
  return (await http.patch<{ settings: RecordSettingsWire }>(`/clubs/${id(clubId)}/record-settings`, body)).settings;
}

/** Public: no sign-in, and a 401 never signs anyone out. */
export async function verifyCode(code: string): Promise<CodeAnswer> {
  return http.get<CodeAnswer>(`/verify/${id(code)}`, { allowUnauthenticated: true });
}

// The review's e-mails, queued through the outbox inside the transaction of the change they announce:
// the builder hears of every decision (and of a revoked record), opted-in stewards of every new
// submission in their club's queue.
import type { EntityManager } from 'typeorm';
import { approvedText, decisionSubjectText, waiverCountText } from '../contracts/verdict-words';
import type { MailService } from './mail';
import { renderMail } from './mail';

export interface ReviewMailDeps {
  mail: MailService;
  publicUrl: string;
}

interface Person {
  email: string;
  displayName: string;
}

const DECISION_LINES = {
  approve: 'approved your submission',
  request_changes: 'asked for changes before approving your submission',
  reject: 'rejected your submission',
} as const;

export type DecisionKind = keyof typeof DECISION_LINES;

/** A finding the steward waived, as the mail names it. */
export interface WaivedFindingText {
  /** "Door bars 1.500 × 0.095 in, door bar db1 (section C4.2.2)" */
  finding: string;
  reason: string;
}

export async function mailDecision(
  deps: ReviewMailDeps, em: EntityManager,
  input: {
    builder: Person; steward: string; clubId: string; clubName: string; carName: string; submissionId: string; decision: DecisionKind; note: string | null;
    recordNumber?: string; expiresOn?: string; waived?: WaivedFindingText[];
  },
): Promise<void> {
  const waived = input.waived ?? [];
  // The same words as the submission page the mail links to (contracts/verdict-words.ts).
  const outcome = input.decision === 'approve' ? `${approvedText(waived.length)}.` : '';
  const paragraphs = [
    `${input.steward} ${DECISION_LINES[input.decision]} for ${input.carName} in ${input.clubName}. ${outcome}`.trim(),
    input.note ? (input.decision === 'approve' ? `Steward's note: ${input.note}` : input.decision === 'reject' ? `Reason: ${input.note}` : `What to change: ${input.note}`) : '',
    waived.length
      ? `The steward accepted ${waiverCountText(waived.length)} in writing. A waived finding does not meet the rule as written; it stays on the record as waived:\n${waived.map((w) => `• ${w.finding}: ${w.reason}`).join('\n')}`
      : '',
    input.recordNumber
      ? `Cage record ${input.recordNumber} is issued${input.expiresOn ? `, valid until ${input.expiresOn}` : ''}. Its PDF report carries a QR code anyone at the track can scan to check it.`
      : '',
    input.decision === 'request_changes' ? 'Make the changes on the build sheet, run a new check and resubmit it from the check run page.' : '',
  ];
  await deps.mail.enqueue(
    {
      to: input.builder.email,
      kind: 'review.decided',
      related: { clubId: input.clubId, submissionId: input.submissionId },
      ...renderMail({
        subject: `Steward decision on ${input.carName}: ${decisionSubjectText(input.decision, waived.length)}`,
        greeting: `Hello ${input.builder.displayName},`,
        paragraphs,
        action: { label: 'Open the submission', url: `${deps.publicUrl}/submissions/${input.submissionId}` },
        reason: `You submitted a check for review in ${input.clubName}.`,
      }),
    },
    { manager: em },
  );
}

export async function mailRevoked(
  deps: ReviewMailDeps, em: EntityManager,
  input: { builder: Person; clubId: string; clubName: string; carName: string; recordNumber: string; reason: string; recordId: string },
): Promise<void> {
  await deps.mail.enqueue(
    {
      to: input.builder.email,
      kind: 'review.record_revoked',
      related: { clubId: input.clubId, recordId: input.recordId },
      ...renderMail({
        subject: `Cage record ${input.recordNumber} revoked`,
        greeting: `Hello ${input.builder.displayName},`,
        paragraphs: [`${input.clubName} revoked cage record ${input.recordNumber} for ${input.carName}.`, `Reason: ${input.reason}`],
        action: { label: 'Open the record', url: `${deps.publicUrl}/cage-records/${input.recordId}` },
        reason: `The record is for your car in ${input.clubName}.`,
      }),
    },
    { manager: em },
  );
}

/** Tells the club's opted-in stewards (never the builder themself) that a submission is waiting. */
export async function mailNewSubmission(
  deps: ReviewMailDeps, em: EntityManager,
  input: {
    clubId: string; clubName: string; carName: string; builderId: string; builderName: string; submissionId: string; resubmission: boolean;
    /** The steward a resubmission went back to: told whether or not they asked for mail. */
    returnedTo?: Person & { id: string };
  },
): Promise<void> {
  const back = input.returnedTo;
  if (back) {
    await deps.mail.enqueue(
      {
        to: back.email,
        kind: 'review.submitted',
        related: { clubId: input.clubId, submissionId: input.submissionId },
        ...renderMail({
          subject: `Back with you for review: ${input.carName}`,
          greeting: `Hello ${back.displayName},`,
          paragraphs: [
            `${input.builderName} resubmitted a check of ${input.carName} in ${input.clubName} after the changes you asked for.`,
            'It is claimed for you already. If another steward should take it, release it on the submission page.',
          ],
          action: { label: 'Open the submission', url: `${deps.publicUrl}/submissions/${input.submissionId}` },
          reason: `You asked for the changes on this car as a steward of ${input.clubName}.`,
        }),
      },
      { manager: em },
    );
  }
  const stewards: Person[] = await em.query(
    `SELECT u.email, u.display_name AS "displayName" FROM steward_mail_opt_ins o
       JOIN memberships m ON m.user_id = o.user_id AND m.club_id = o.club_id
       JOIN users u ON u.id = o.user_id
     WHERE o.club_id = $1 AND 'steward' = ANY(m.roles) AND o.user_id <> $2 AND o.user_id <> $3`,
    [input.clubId, input.builderId, back?.id ?? input.builderId],
  );
  for (const s of stewards) {
    await deps.mail.enqueue(
      {
        to: s.email,
        kind: 'review.submitted',
        related: { clubId: input.clubId, submissionId: input.submissionId },
        ...renderMail({
          subject: `${input.resubmission ? 'Resubmission' : 'New submission'} for review: ${input.carName}`,
          greeting: `Hello ${s.displayName},`,
          paragraphs: [
            `${input.builderName} ${input.resubmission ? 'resubmitted' : 'submitted'} a check of ${input.carName} for review in ${input.clubName}.`,
            ...(back ? [`It went back to ${back.displayName}, who asked for the changes.`] : []),
          ],
          action: { label: 'Open the submission', url: `${deps.publicUrl}/submissions/${input.submissionId}` },
          reason: `You asked to hear of new submissions as a steward of ${input.clubName}. Turn this off in the review queue.`,
        }),
      },
      { manager: em },
    );
  }
}

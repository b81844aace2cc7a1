// Who may see and act on a submission, and the mapping between its row and the pure workflow's
// value. The builder who submitted it and the stewards and admins of its club see it; everyone
// else gets the same 404 as for an id that does not exist. Workflow refusals become typed errors.
import type { EntityManager } from 'typeorm';
import type { CheckReport } from '../contracts/report';
import type { ClubRole } from '../domain/review/workflow';
import type { ReviewRefusal, Submission as DomainSubmission } from '../domain/review/workflow';
import { Membership, Submission } from '../entities';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors';

export interface SubmissionAccess {
  row: Submission;
  roles: ClubRole[];
  isBuilder: boolean;
  isReviewer: boolean;
}

export const notFound = () => new NotFoundError('Submission not found.');

export async function rolesIn(em: EntityManager, userId: string, clubId: string): Promise<ClubRole[]> {
  const m = await em.getRepository(Membership).findOneBy({ userId, clubId });
  return m ? [...m.roles] : [];
}

/** Loads a submission `userId` may see (locked FOR UPDATE when `lock`), or throws 404. */
export async function submissionFor(em: EntityManager, submissionId: string, userId: string, lock = false): Promise<SubmissionAccess> {
  const row = await em.getRepository(Submission).findOne({ where: { id: submissionId }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
  if (!row) throw notFound();
  const roles = await rolesIn(em, userId, row.clubId);
  const isBuilder = row.builderId === userId;
  const isReviewer = roles.includes('steward') || roles.includes('admin');
  if (!isBuilder && !isReviewer) throw notFound();
  return { row, roles, isBuilder, isReviewer };
}

export function toDomain(row: Submission, report: CheckReport): DomainSubmission {
  return {
    id: row.id,
    state: row.state,
    version: row.version,
    builderId: row.builderId,
    checkRunId: row.checkRunId,
    assignedStewardId: row.assignedStewardId,
    previousSubmissionId: row.previousSubmissionId,
    resubmittedAsId: row.resubmittedAsId,
    findings: report.findings,
    waivers: row.waivers,
    decisionNote: row.decisionNote,
  };
}

const forbiddenCodes = new Set(['forbidden_role', 'not_builder', 'own_submission', 'not_assigned_steward']);
const fieldOf: Partial<Record<ReviewRefusal['code'], string>> = {
  note_required: 'note', reason_required: 'reason', waiver_reason_required: 'reason',
  unknown_finding: 'findingKey', not_waivable: 'findingKey', unknown_waiver: 'findingKey',
};

/** The workflow's refusal as the one error shape: 403 for the wrong person, 400 for a bad note, 409 for the rest. */
export function refusalError(refusal: ReviewRefusal): AppError {
  if (forbiddenCodes.has(refusal.code)) return new ForbiddenError(refusal.message);
  const field = fieldOf[refusal.code];
  if (field) return new ValidationError([{ path: field, message: refusal.message }], refusal.message);
  return new ConflictError(refusal.message, { reason: refusal.code, ...(refusal.details ?? {}) });
}

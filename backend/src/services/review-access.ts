// Loading a submission for someone, and the mapping between its row and the pure workflow's value.
// The access policy's `submission.read` decides who sees it (the builder who submitted it and the
// stewards and admins of its club); everyone else gets the same 404 as for an id that does not exist.
// Workflow refusals become typed errors.
import type { EntityManager } from 'typeorm';
import type { CheckReport } from '../contracts/report';
import type { ClubRole } from '../domain/review/workflow';
import type { ReviewRefusal, Submission as DomainSubmission } from '../domain/review/workflow';
import type { AccessFacts } from '../domain/access-policy';
import { Submission } from '../entities';
import { AppError, ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors';
import { enforce, rolesIn } from './access';

export interface SubmissionAccess {
  row: Submission;
  roles: ClubRole[];
  isBuilder: boolean;
}

export const notFound = () => new NotFoundError('Submission not found.');

/** The caller's roles in `clubId`; none when they are not a member (what the workflow's actor carries). */
export async function rolesOf(em: EntityManager, userId: string, clubId: string): Promise<ClubRole[]> {
  return (await rolesIn(em, userId, clubId)) ?? [];
}

/** The policy's facts about a submission and its caller. */
export const submissionFacts = (a: Pick<SubmissionAccess, 'row' | 'roles'>, userId: string): AccessFacts => ({ actorId: userId, ownerId: a.row.builderId, roles: a.roles });

/** Loads a submission `userId` may see (locked FOR UPDATE when `lock`), or throws 404. */
export async function submissionFor(em: EntityManager, submissionId: string, userId: string, lock = false): Promise<SubmissionAccess> {
  const row = await em.getRepository(Submission).findOne({ where: { id: submissionId }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
  if (!row) throw notFound();
  const roles = await rolesOf(em, userId, row.clubId);
  // The car's owner reads its submissions too: after a sale the new owner sees the car's review history
  // (the workflow's builder-only actions still ask for the builder who submitted).
  const carOwner: { owner_id: string }[] = row.builderId === userId ? [] : await em.query(`SELECT owner_id FROM cars WHERE id = $1`, [row.carId]);
  const ownerId = carOwner[0]?.owner_id === userId ? userId : row.builderId;
  enforce('submission.read', { actorId: userId, ownerId, roles }, { notFound: 'Submission not found.' });
  return { row, roles, isBuilder: row.builderId === userId };
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

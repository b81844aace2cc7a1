// Reviews of submitted check runs: submit, resubmit, the claim/waive/decide/withdraw actions, notes
// on findings, and the stewards' mail opt-in. Every action locks the submission row, asks the pure
// workflow (domain/review/workflow.ts), and in the same transaction writes the new row (guarded by
// its version), the event, the activity log entry, the mail, and on approval the cage record.
import { randomUUID } from 'node:crypto';
import { IsNull, type DataSource, type EntityManager } from 'typeorm';
import type { ActionBody, AnnotationBody, MySubmissionWire, ResubmitBody, SubmitBody } from '../contracts/review';
import { resubmit, submitForReview, applyReviewAction, FINAL_STATES, type AuditEvent, type ReviewAction } from '../domain/review/workflow';
import { findingKey, overallWithWaivers } from '../domain/review/waivers';
import { calendarDateIn, formatIsoDate } from '../domain/dates';
import { MEMBER_KIND_LABELS } from '../domain/vocabulary';
import { BuildSheet, BuildSheetRevision, Car, CheckRun, Club, FindingAnnotation, Photo, StewardMailOptIn, Submission, SubmissionEvent, User } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import type { AuditService } from './audit.service';
import type { CageRecordService } from './cage-records.service';
import { sheetFor } from './garage.service';
import { enforce, rolesIn } from './access';
import { refusalError, rolesOf, submissionFacts, submissionFor, toDomain } from './review-access';
import { mailDecision, mailNewSubmission, type DecisionKind, type ReviewMailDeps } from './review-mail';

export interface ReviewDeps extends ReviewMailDeps {
  audit: AuditService;
  records: CageRecordService;
}

const OPEN_STATES = ['pending', 'in_review'] as const;

interface SubmissionAbout {
  car: { id: string; name: string };
  sheet: { id: string; name: string };
  record?: { id: string; number: string };
  /** A resubmission that went back to the steward who asked for the changes. */
  returnedTo?: { id: string; name: string };
}

export type ReviewService = ReturnType<typeof createReviewService>;

export function createReviewService(ds: DataSource, deps: ReviewDeps) {
  /**
   * The event, and its activity-log entry with the names the log reads in words (the car, the sheet, the
   * record an approval issued), so the entry still says what it was about after any of them is renamed.
   */
  async function storeEvent(tx: EntityManager, submissionId: string, clubId: string, event: AuditEvent, about: SubmissionAbout): Promise<void> {
    await tx.getRepository(SubmissionEvent).insert({ submissionId, fromState: event.from, toState: event.to, action: event.action, actorId: event.actorId, note: event.note });
    const record = about.record ? { recordId: about.record.id, recordNumber: about.record.number } : {};
    const returned = about.returnedTo ? { returnedToId: about.returnedTo.id, returnedToName: about.returnedTo.name } : {};
    await deps.audit.record(
      {
        clubId, actorId: event.actorId, action: `submission.${event.action}`, entity: { type: 'submission', id: submissionId },
        details: {
          from: event.from, to: event.to, ...(event.note ? { note: event.note } : {}),
          carId: about.car.id, carName: about.car.name, sheetId: about.sheet.id, sheetName: about.sheet.name, ...record, ...returned,
        },
      },
      { manager: tx },
    );
  }

  /** The run `userId` wants to submit, with its sheet and car; 404 unless they may read the sheet. */
  async function runToSubmit(tx: EntityManager, checkRunId: string, userId: string) {
    const run = await tx.getRepository(CheckRun).findOneBy({ id: checkRunId });
    const revision = run?.buildSheetRevisionId ? await tx.getRepository(BuildSheetRevision).findOneBy({ id: run.buildSheetRevisionId }) : null;
    if (!run || !revision) throw new NotFoundError('Check run not found.');
    let found;
    try {
      found = await sheetFor(tx, revision.buildSheetId, userId, 'submit', true);
    } catch (err) {
      if (err instanceof NotFoundError) throw new NotFoundError('Check run not found.');
      throw err;
    }
    const open = await tx.getRepository(Submission).findOne({ where: OPEN_STATES.map((state) => ({ buildSheetId: found.sheet.id, state })) });
    if (open) throw new ConflictError('This build sheet already has a submission waiting for review. Withdraw it first, or wait for the decision.', { reason: 'already_open', submissionId: open.id });
    const photos = await tx.getRepository(Photo).find({ where: { buildSheetId: found.sheet.id }, order: { createdAt: 'ASC', id: 'ASC' } });
    return { run, sheet: found.sheet, car: found.car, photoIds: photos.map((p) => p.id) };
  }

  async function announce(tx: EntityManager, s: Submission, carName: string, resubmission: boolean, returnedTo: User | null = null): Promise<void> {
    const club = await tx.getRepository(Club).findOneByOrFail({ id: s.clubId });
    const builder = await tx.getRepository(User).findOneByOrFail({ id: s.builderId });
    await mailNewSubmission(deps, tx, {
      clubId: club.id, clubName: club.name, carName, builderId: builder.id, builderName: builder.displayName, submissionId: s.id, resubmission,
      ...(returnedTo ? { returnedTo: { id: returnedTo.id, email: returnedTo.email, displayName: returnedTo.displayName } } : {}),
    });
  }

  const note = (text: string | undefined) => (text?.trim() ? text.trim() : null);

  return {
    async submit(userId: string, body: SubmitBody): Promise<{ id: string }> {
      return ds.transaction(async (tx) => {
        const { run, sheet, car, photoIds } = await runToSubmit(tx, body.checkRunId, userId);
        const roles = await rolesOf(tx, userId, sheet.clubId);
        // Only the caller's own request for changes: after a car is sold, its new owner submits afresh.
        const resubmittable = await tx.getRepository(Submission).findOne({ where: { buildSheetId: sheet.id, state: 'changes_requested', resubmittedAsId: IsNull(), builderId: userId } });
        if (resubmittable)
          throw new ConflictError('A steward asked for changes on this build sheet: resubmit that submission instead, so the steward sees what changed.', { reason: 'resubmit_instead', submissionId: resubmittable.id });
        const result = submitForReview({ id: randomUUID(), checkRunId: run.id, checkRunOwnerId: run.createdById, findings: run.report.findings }, { id: userId, roles });
        if (!result.ok) throw refusalError(result);
        const s = await tx.getRepository(Submission).save(tx.getRepository(Submission).create({
          id: result.submission.id, clubId: sheet.clubId, carId: car.id, buildSheetId: sheet.id, checkRunId: run.id, builderId: userId,
          state: 'pending', version: 1, classId: run.classId, builderNote: note(body.note), assignedStewardId: null, previousSubmissionId: null,
          resubmittedAsId: null, waivers: [], photoIds, decisionNote: null, decidedAt: null,
        }));
        await storeEvent(tx, s.id, s.clubId, { ...result.event, note: s.builderNote }, { car, sheet });
        await announce(tx, s, car.name, false);
        return { id: s.id };
      });
    },

    async resubmit(previousId: string, userId: string, body: ResubmitBody): Promise<{ id: string }> {
      return ds.transaction(async (tx) => {
        const found = await submissionFor(tx, previousId, userId, true);
        enforce('submission.resubmit', submissionFacts(found, userId), { notFound: 'Submission not found.', forbidden: 'Only the builder who submitted it can resubmit.' });
        const { row: prev, roles } = found;
        const { run, sheet, car, photoIds } = await runToSubmit(tx, body.checkRunId, userId);
        if (sheet.id !== prev.buildSheetId) throw new ValidationError([{ path: 'checkRunId', message: 'Resubmit a check run of the same build sheet.' }]);
        if (run.id === prev.checkRunId) throw new ValidationError([{ path: 'checkRunId', message: 'This is the check the steward already saw. Make the changes, run a new check, then resubmit.' }]);
        const prevRun = await tx.getRepository(CheckRun).findOneByOrFail({ id: prev.checkRunId });
        // Back to the steward who asked for the changes, while they are still a steward of the club.
        const asker = prev.assignedStewardId ? await tx.getRepository(User).findOneBy({ id: prev.assignedStewardId }) : null;
        const returnTo = asker && (await rolesOf(tx, asker.id, prev.clubId)).includes('steward') ? asker : null;
        const result = resubmit(toDomain(prev, prevRun.report), { id: randomUUID(), checkRunId: run.id, checkRunOwnerId: run.createdById, findings: run.report.findings }, { id: userId, roles }, body.expected, returnTo?.id ?? null);
        if (!result.ok) throw refusalError(result);
        const repo = tx.getRepository(Submission);
        const returned = result.submission.assignedStewardId !== null && returnTo ? returnTo : null;
        const s = await repo.save(repo.create({
          id: result.submission.id, clubId: prev.clubId, carId: car.id, buildSheetId: sheet.id, checkRunId: run.id, builderId: userId,
          state: result.submission.state, version: 1, classId: run.classId, builderNote: note(body.note), assignedStewardId: returned?.id ?? null, previousSubmissionId: prev.id,
          resubmittedAsId: null, waivers: [], photoIds, decisionNote: null, decidedAt: null,
        }));
        await repo.update({ id: prev.id, version: prev.version }, { resubmittedAsId: s.id, version: result.previous.version });
        await storeEvent(tx, prev.id, prev.clubId, result.events.previous, { car, sheet });
        await storeEvent(tx, s.id, s.clubId, { ...result.events.submission, note: s.builderNote ?? result.events.submission.note }, { car, sheet, ...(returned ? { returnedTo: { id: returned.id, name: returned.displayName } } : {}) });
        await announce(tx, s, car.name, true, returned);
        return { id: s.id };
      });
    },

    async act(submissionId: string, userId: string, body: ActionBody): Promise<void> {
      await ds.transaction(async (tx) => {
        const { row, roles } = await submissionFor(tx, submissionId, userId, true);
        const run = await tx.getRepository(CheckRun).findOneByOrFail({ id: row.checkRunId });
        const result = applyReviewAction(toDomain(row, run.report), body as ReviewAction, { id: userId, roles });
        if (!result.ok) throw refusalError(result);
        const next = result.submission;
        const decided = FINAL_STATES.includes(next.state) && next.state !== row.state;
        const now = new Date();
        // The row lock already serialises actions; the version guard makes a lost update impossible even without it.
        const updated = await tx.getRepository(Submission).update(
          { id: row.id, version: row.version },
          { state: next.state, version: next.version, assignedStewardId: next.assignedStewardId, waivers: [...next.waivers], decisionNote: next.decisionNote, ...(decided ? { decidedAt: now } : {}) },
        );
        if (updated.affected !== 1) throw new ConflictError('The submission changed meanwhile. Reload it and decide again.', { reason: 'conflict' });
        const car = await tx.getRepository(Car).findOneByOrFail({ id: row.carId });
        const sheet = await tx.getRepository(BuildSheet).findOneByOrFail({ id: row.buildSheetId });
        // An approval issues the record first, so its entry can say "approved <car>, record <number>".
        const record = body.type === 'approve'
          ? await deps.records.issue(tx, {
            clubId: row.clubId, submissionId: row.id, carId: row.carId, classId: run.classId, className: run.report.className,
            rulesetVersionId: run.rulesetVersionId, rulebookTitle: run.report.rulebook.title, edition: run.report.rulebook.edition, stewardId: userId, at: now,
          })
          : null;
        await storeEvent(tx, row.id, row.clubId, result.event, { car, sheet, ...(record ? { record } : {}) });
        if (record) {
          await deps.audit.record(
            {
              clubId: row.clubId, actorId: userId, action: 'cage_record.issued', entity: { type: 'cage_record', id: record.id },
              details: { number: record.number, submissionId: row.id, carId: car.id, carName: car.name, sheetId: sheet.id, sheetName: sheet.name },
            },
            { manager: tx },
          );
        }
        if (body.type === 'approve' || body.type === 'request_changes' || body.type === 'reject') {
          const club = await tx.getRepository(Club).findOneByOrFail({ id: row.clubId });
          const steward = await tx.getRepository(User).findOneByOrFail({ id: userId });
          const builder = await tx.getRepository(User).findOneByOrFail({ id: row.builderId });
          const byKey = new Map(run.report.findings.map((f) => [findingKey(f), f]));
          const waived = body.type === 'approve'
            ? overallWithWaivers(run.report.findings, next.waivers).findings.filter((f) => f.waiver).map((f) => {
                const finding = byKey.get(f.key)!;
                const subject = finding.member ? `${MEMBER_KIND_LABELS[finding.member.kind]} ${finding.member.id}` : finding.plate ? `plate ${finding.plate.id}` : 'whole car';
                return { finding: `${finding.title}, ${subject} (section ${finding.citation.section})`, reason: f.waiver!.reason };
              })
            : [];
          await mailDecision(deps, tx, {
            builder, steward: steward.displayName, clubId: club.id, clubName: club.name, carName: car.name, submissionId: row.id,
            decision: body.type as DecisionKind, note: next.decisionNote, waived,
            ...(record ? { recordNumber: record.number, expiresOn: formatIsoDate(calendarDateIn(record.expiresAt, club.timeZone)) } : {}),
          });
        }
      });
    },

    async annotate(submissionId: string, userId: string, body: AnnotationBody): Promise<void> {
      await ds.transaction(async (tx) => {
        const found = await submissionFor(tx, submissionId, userId, true);
        const { row, roles } = found;
        enforce('submission.annotate', submissionFacts(found, userId), {
          notFound: 'Submission not found.',
          forbidden: roles.includes('steward') ? 'A steward cannot review their own submission; another steward must.' : 'Only a steward of this club can annotate findings.',
        });
        const run = await tx.getRepository(CheckRun).findOneByOrFail({ id: row.checkRunId });
        if (!run.report.findings.some((f) => findingKey(f) === body.findingKey))
          throw new ValidationError([{ path: 'findingKey', message: 'That finding is not in this submission’s report.' }]);
        const saved = await tx.getRepository(FindingAnnotation).save({ submissionId: row.id, findingKey: body.findingKey, authorId: userId, text: body.text });
        const car = await tx.getRepository(Car).findOneByOrFail({ id: row.carId });
        await deps.audit.record(
          {
            clubId: row.clubId, actorId: userId, action: 'submission.annotated', entity: { type: 'submission', id: row.id },
            details: { findingKey: body.findingKey, annotationId: saved.id, carId: car.id, carName: car.name },
          },
          { manager: tx },
        );
      });
    },

    /** The caller's own submissions, newest first (optionally of one check run's build sheet). */
    async mine(userId: string, checkRunId?: string): Promise<MySubmissionWire[]> {
      let sheetId: string | undefined;
      if (checkRunId) {
        const run = await ds.getRepository(CheckRun).findOneBy({ id: checkRunId });
        const rev = run?.buildSheetRevisionId ? await ds.getRepository(BuildSheetRevision).findOneBy({ id: run.buildSheetRevisionId }) : null;
        if (!run || !rev || run.createdById !== userId) return [];
        sheetId = rev.buildSheetId;
      }
      const rows = await ds.getRepository(Submission).find({ where: { builderId: userId, ...(sheetId ? { buildSheetId: sheetId } : {}) }, order: { createdAt: 'DESC' }, take: 100 });
      const runs = rows.length ? await ds.getRepository(CheckRun).createQueryBuilder('r').where('r.id IN (:...ids)', { ids: rows.map((s) => s.checkRunId) }).getMany() : [];
      const findingsOf = new Map(runs.map((r) => [r.id, r.report.findings]));
      return rows.map((s) => ({ id: s.id, state: s.state, version: s.version, waivedCount: overallWithWaivers(findingsOf.get(s.checkRunId) ?? [], s.waivers).waivedCount, checkRunId: s.checkRunId, createdAt: s.createdAt.toISOString(), decisionNote: s.decisionNote, resubmittedAsId: s.resubmittedAsId }));
    },

    async mailOptIn(clubId: string, userId: string): Promise<boolean> {
      return (await ds.getRepository(StewardMailOptIn).countBy({ clubId, userId })) > 0;
    },

    async setMailOptIn(clubId: string, userId: string, enabled: boolean): Promise<boolean> {
      // The route's guard asked `club.steward` already; the service does not rely on it.
      enforce('club.steward', { actorId: userId, roles: await rolesIn(ds.manager, userId, clubId) }, { notFound: 'Club not found.', forbidden: 'Only stewards can ask for mail on new submissions.' });
      if (enabled) await ds.getRepository(StewardMailOptIn).upsert({ clubId, userId }, ['userId', 'clubId']);
      else await ds.getRepository(StewardMailOptIn).delete({ clubId, userId });
      return enabled;
    },
  };
}

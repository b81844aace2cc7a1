// What stewards and builders read: the club's queue (filters, sorting, counts by state) and one
// submission in full – the report, waivers, notes, photos, the car's earlier submissions, what
// changed since the previous submission, its record, and what the viewer may do next.
import type { DataSource } from 'typeorm';
import type {
  ChangesSinceWire, HistoryItemWire, QueueItemWire, QueueQuery, QueueWire, SubmissionDetailWire, SubmissionStateWire,
} from '../contracts/review';
import { SUBMISSION_STATES } from '../contracts/review';
import { describeRulesetChanges } from '../domain/rulebook/diff';
import { overallWithWaivers } from '../domain/review/waivers';
import type { UnitSystem } from '../domain/units';
import { BuildSheet, BuildSheetRevision, CageRecord, Car, CheckRun, Club, FindingAnnotation, Photo, RulesetVersion, Submission, SubmissionEvent, User } from '../entities';
import type { CageRecordService } from './cage-records.service';
import { diffSpecifications } from './garage/revision-diff';
import type { ReportService } from './reports.service';
import { approvedSubmissionPdf } from './review-report';
import { photoView } from './photos.service';
import { allows } from '../domain/access-policy';
import { submissionFacts, submissionFor } from './review-access';

const AGE_DAYS: Record<QueueQuery['age'], number> = { any: 0, over_3_days: 3, over_7_days: 7, over_14_days: 14 };
const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);

interface QueueRow {
  id: string; state: SubmissionStateWire; version: number; car_id: string; car_name: string; race_number: string | null;
  builder_id: string; builder_name: string; class_id: string; class_name: string; verdict: QueueItemWire['verdict'];
  steward_id: string | null; steward_name: string | null; previous_submission_id: string | null; resubmitted_as_id: string | null;
  waivers: Submission['waivers']; findings: CheckRun['report']['findings']; created_at: Date; updated_at: Date;
}

/** A request for changes the builder answered with a resubmission is not open any more. */
const stateFilter = (state: string, param: string) =>
  state === 'changes_requested' ? `(s.state = ${param} AND s.resubmitted_as_id IS NULL)` : `s.state = ${param}`;

export type ReviewReader = ReturnType<typeof createReviewReader>;

export function createReviewReader(ds: DataSource, deps: { records: CageRecordService; reports: ReportService; publicUrl: string }) {
  const person = async (id: string | null) => {
    if (!id) return null;
    const u = await ds.getRepository(User).findOneBy({ id });
    return u ? { id: u.id, displayName: u.displayName } : null;
  };
  const unitsOf = async (userId: string): Promise<UnitSystem> => (await ds.getRepository(User).findOneBy({ id: userId }))?.preferredUnits ?? 'imperial';
  const revisionNumberOf = async (run: CheckRun) =>
    run.buildSheetRevisionId ? ((await ds.getRepository(BuildSheetRevision).findOneBy({ id: run.buildSheetRevisionId }))?.number ?? null) : null;

  async function changesSince(s: Submission, run: CheckRun, units: UnitSystem): Promise<ChangesSinceWire | null> {
    if (!s.previousSubmissionId) return null;
    const prev = await ds.getRepository(Submission).findOneBy({ id: s.previousSubmissionId });
    if (!prev) return null;
    const prevRun = await ds.getRepository(CheckRun).findOneByOrFail({ id: prev.checkRunId });
    const rulesetChanged = prevRun.rulesetVersionId !== run.rulesetVersionId;
    let rulesetChanges: string[] = [];
    if (rulesetChanged) {
      const [before, after] = await Promise.all([prevRun.rulesetVersionId, run.rulesetVersionId].map((id) => ds.getRepository(RulesetVersion).findOneByOrFail({ id })));
      rulesetChanges = describeRulesetChanges(before!.document, after!.document, { unitSystem: units }).map((c) => c.text);
    }
    return {
      previousSubmissionId: prev.id, previousDecisionNote: prev.decisionNote,
      fromRevision: await revisionNumberOf(prevRun), toRevision: await revisionNumberOf(run),
      changes: diffSpecifications(prevRun.specification, run.specification, units), rulesetChanges, rulesetChanged,
    };
  }

  return {
    /** The PDF of an approved submission (its record, decision, waivers and the QR of the check link). */
    approvedPdf(submissionId: string, userId: string, units?: UnitSystem) {
      return approvedSubmissionPdf(ds, deps, submissionId, userId, units);
    },

    async queue(clubId: string, userId: string, q: QueueQuery): Promise<QueueWire> {
      const where = ['s.club_id = $1'];
      const params: unknown[] = [clubId];
      if (q.state === 'open') where.push(`s.state IN ('pending', 'in_review')`);
      else if (q.state !== 'all') where.push(stateFilter(q.state, `$${params.push(q.state)}`));
      if (q.classId) where.push(`s.class_id = $${params.push(q.classId)}`);
      if (AGE_DAYS[q.age] > 0) where.push(`s.created_at <= now() - make_interval(days => $${params.push(AGE_DAYS[q.age])})`);
      if (q.assigned === 'me') where.push(`s.assigned_steward_id = $${params.push(userId)}`);
      const order = q.sort === 'newest' ? 's.created_at DESC' : q.sort === 'car' ? 'c.name, s.created_at' : 's.created_at ASC';
      const rows: QueueRow[] = await ds.query(
        `SELECT s.id, s.state, s.version, c.id AS car_id, c.name AS car_name, c.race_number, b.id AS builder_id, b.display_name AS builder_name,
                s.class_id, cr.report->>'className' AS class_name, cr.report->>'verdict' AS verdict, st.id AS steward_id,
                st.display_name AS steward_name, s.previous_submission_id, s.resubmitted_as_id, s.waivers, cr.report->'findings' AS findings,
                s.created_at, s.updated_at
         FROM submissions s JOIN cars c ON c.id = s.car_id JOIN users b ON b.id = s.builder_id JOIN check_runs cr ON cr.id = s.check_run_id
         LEFT JOIN users st ON st.id = s.assigned_steward_id
         WHERE ${where.join(' AND ')} ORDER BY ${order}, s.id LIMIT 500`,
        params,
      );
      const countRows: { state: SubmissionStateWire; n: string }[] = await ds.query(
        `SELECT state, count(*) AS n FROM submissions WHERE club_id = $1 AND NOT (state = 'changes_requested' AND resubmitted_as_id IS NOT NULL) GROUP BY state`,
        [clubId],
      );
      const counts = Object.fromEntries(SUBMISSION_STATES.map((st) => [st, 0])) as Record<SubmissionStateWire, number>;
      for (const r of countRows) counts[r.state] = Number(r.n);
      const classes: { id: string; name: string }[] = await ds.query(
        `SELECT DISTINCT s.class_id AS id, cr.report->>'className' AS name FROM submissions s JOIN check_runs cr ON cr.id = s.check_run_id WHERE s.club_id = $1 ORDER BY 2`,
        [clubId],
      );
      return {
        items: rows.map((r) => {
          const overall = overallWithWaivers(r.findings ?? [], r.waivers ?? []);
          return {
            id: r.id, state: r.state, version: r.version, car: { id: r.car_id, name: r.car_name, raceNumber: r.race_number },
            builder: { id: r.builder_id, displayName: r.builder_name }, classId: r.class_id, className: r.class_name, verdict: r.verdict,
            reviewVerdict: overall.verdict, waivedCount: overall.waivedCount,
            assignedSteward: r.steward_id ? { id: r.steward_id, displayName: r.steward_name ?? '' } : null, isResubmission: r.previous_submission_id !== null,
            resubmittedAsId: r.resubmitted_as_id, createdAt: iso(r.created_at)!, updatedAt: iso(r.updated_at)!,
          };
        }),
        counts,
        classes,
      };
    },

    async detail(submissionId: string, userId: string): Promise<SubmissionDetailWire> {
      const { row: s, roles, isBuilder } = await submissionFor(ds.manager, submissionId, userId);
      const run = await ds.getRepository(CheckRun).findOneByOrFail({ id: s.checkRunId });
      const [club, car, sheet] = await Promise.all([
        ds.getRepository(Club).findOneByOrFail({ id: s.clubId }), ds.getRepository(Car).findOneByOrFail({ id: s.carId }),
        ds.getRepository(BuildSheet).findOneByOrFail({ id: s.buildSheetId }),
      ]);
      const units = await unitsOf(userId);
      const overall = overallWithWaivers(run.report.findings, s.waivers);
      const photoRows = s.photoIds.length ? await ds.getRepository(Photo).createQueryBuilder('p').where('p.id IN (:...ids)', { ids: s.photoIds }).getMany() : [];
      const photos = s.photoIds.flatMap((id) => photoRows.filter((p) => p.id === id)).map(photoView);
      const events = await ds.getRepository(SubmissionEvent).find({ where: { submissionId: s.id }, order: { createdAt: 'ASC', id: 'ASC' } });
      const annotations = await ds.getRepository(FindingAnnotation).find({ where: { submissionId: s.id }, order: { createdAt: 'ASC', id: 'ASC' } });
      const people = new Map<string, { id: string; displayName: string } | null>();
      const who = async (id: string | null) => {
        if (!id) return null;
        if (!people.has(id)) people.set(id, await person(id));
        return people.get(id) ?? null;
      };
      const others = await ds.getRepository(Submission).find({ where: { carId: s.carId }, order: { createdAt: 'DESC' } });
      const history: HistoryItemWire[] = [];
      for (const o of others.filter((x) => x.id !== s.id)) {
        // The builder sees all their own; a steward sees only this club's.
        if (o.clubId !== s.clubId && !isBuilder) continue;
        const oRun = await ds.getRepository(CheckRun).findOneByOrFail({ id: o.checkRunId });
        const rec = await ds.getRepository(CageRecord).findOneBy({ submissionId: o.id });
        history.push({ id: o.id, state: o.state, waivedCount: overallWithWaivers(oRun.report.findings, o.waivers).waivedCount, resubmittedAsId: o.resubmittedAsId, createdAt: o.createdAt.toISOString(), decidedAt: iso(o.decidedAt), decisionNote: o.decisionNote, revisionNumber: await revisionNumberOf(oRun), recordNumber: rec?.number ?? null });
      }
      const recordRow = await ds.getRepository(CageRecord).findOneBy({ submissionId: s.id });
      const isSteward = roles.includes('steward') && !isBuilder;
      return {
        id: s.id, state: s.state, version: s.version, club: { id: club.id, name: club.name },
        car: { id: car.id, name: car.name, raceNumber: car.raceNumber, make: car.make, model: car.model, year: car.year },
        buildSheet: { id: sheet.id, name: sheet.name }, builder: (await who(s.builderId))!, assignedSteward: await who(s.assignedStewardId),
        builderNote: s.builderNote, decisionNote: s.decisionNote, decidedAt: iso(s.decidedAt), createdAt: s.createdAt.toISOString(), updatedAt: s.updatedAt.toISOString(),
        previousSubmissionId: s.previousSubmissionId, resubmittedAsId: s.resubmittedAsId,
        checkRun: { id: run.id, verificationCode: run.verificationCode, createdAt: run.createdAt.toISOString(), revisionNumber: await revisionNumberOf(run), report: run.report, specification: run.specification },
        waivers: await Promise.all(s.waivers.map(async (w) => ({ findingKey: w.findingKey, reason: w.reason, steward: await who(w.stewardId) }))),
        overall: { verdict: overall.verdict, blocking: overall.blocking, waivedCount: overall.waivedCount },
        photos,
        events: await Promise.all(events.map(async (e) => ({ from: e.fromState as SubmissionStateWire | null, to: e.toState as SubmissionStateWire, action: e.action, actor: await who(e.actorId), note: e.note, createdAt: e.createdAt.toISOString() }))),
        annotations: await Promise.all(annotations.map(async (a) => ({ id: a.id, findingKey: a.findingKey, text: a.text, author: await who(a.authorId), createdAt: a.createdAt.toISOString() }))),
        history,
        changesSince: await changesSince(s, run, units),
        record: recordRow ? await deps.records.view(ds.manager, recordRow, { userId, roles }) : null,
        can: {
          claim: isSteward && s.state === 'pending',
          release: (s.state === 'in_review' || (s.state === 'changes_requested' && !s.resubmittedAsId && s.assignedStewardId !== null))
            && ((isSteward && s.assignedStewardId === userId) || roles.includes('admin')),
          decide: isSteward && s.state === 'in_review' && s.assignedStewardId === userId,
          withdraw: isBuilder && (s.state === 'pending' || s.state === 'in_review'),
          resubmit: isBuilder && s.state === 'changes_requested' && !s.resubmittedAsId,
          annotate: allows('submission.annotate', submissionFacts({ row: s, roles }, userId)) && s.state !== 'withdrawn',
        },
      };
    },
  };
}

// The publish job (queue `ruleset.republish`): re-checks every active build sheet of the affected
// classes against the newly published edition, stores each result in ruleset_recheck_results
// (verdict before and after; the builders' own check runs stay as they were) and, for each sheet
// whose verdict changed, puts an e-mail to its builder into the outbox in the same transaction as
// the result, only when that result row is new, under an idempotency key. So the job can be killed at
// any point and retried (pg-boss retries it; docs/decisions/0007-jobs-that-finish.md): a retry
// continues with the sheets not stored yet. Sending is the outbox dispatcher's: with the SMTP server
// down the job still completes and the mail goes out when it returns.
import type { DataSource, EntityManager } from 'typeorm';
import type { RulesetDocument } from '../../contracts/ruleset';
import { newerEditionLines } from '../../contracts/edition-words';
import { validateRulesetDocument } from '../../domain/rules/validate';
import { describeRulesetChanges, type RulesetChange } from '../../domain/rulebook/diff';
import type { Jobs, ProgressReporter } from '../jobs';
import { renderMail, type MailService } from '../mail';
import type { AuditService } from '../audit.service';
import { republishQueueName, type RepublishJobData } from '../rulebook-admin.service';
import { recheckSheets, type RecheckEvaluator, type RecheckedSheet } from './recheck';

export interface RepublishDeps {
  ds: DataSource;
  /** Where the sheets are evaluated: the check service's bulk pool (`services.checks.bulk`). */
  evaluator: RecheckEvaluator;
  mail: MailService;
  audit: AuditService;
  publicUrl: string;
  batchSize?: number;
}

interface VersionDocument {
  document: RulesetDocument;
  clubId: string;
  versionNumber: number;
  rulebookId: string;
  status: string;
  lockVersion: number;
}

/** The published version, with every edition name of its rulebook: the mail names the edition each sheet is on. */
type PublishedDocument = VersionDocument & { editions: Map<string, string> };

export async function documentOf(ds: DataSource, id: string): Promise<VersionDocument | null> {
  const rows: (Omit<VersionDocument, 'document'> & { document: unknown })[] = await ds.query(
    `SELECT v.document, r.club_id AS "clubId", v.version_number AS "versionNumber", v.rulebook_id AS "rulebookId", v.status, v.lock_version AS "lockVersion"
     FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE v.id = $1`,
    [id],
  );
  const row = rows[0];
  if (!row) return null;
  const v = validateRulesetDocument(row.document);
  return v.ok ? { ...row, document: v.document } : null;
}

async function publishedDocumentOf(ds: DataSource, id: string): Promise<PublishedDocument | null> {
  const version = await documentOf(ds, id);
  if (!version) return null;
  const siblings: { id: string; edition: string }[] = await ds.query(`SELECT id, edition FROM ruleset_versions WHERE rulebook_id = $1`, [version.rulebookId]);
  return { ...version, editions: new Map(siblings.map((x) => [x.id, x.edition])) };
}

/** The changes a builder of `classId` needs to read: those for that class and those for every class. */
export function changesForClass(changes: readonly RulesetChange[], classId: string): RulesetChange[] {
  return changes.filter((c) => (c.classId ? c.classId === classId : c.classIds && c.classIds.length > 0 ? c.classIds.includes(classId) : c.area !== 'rulebook'));
}

function verdictMail(sheet: RecheckedSheet, published: PublishedDocument, changes: RulesetChange[], publicUrl: string) {
  const doc = published.document;
  const className = doc.classes.find((c) => c.id === sheet.classId)?.name ?? sheet.classId;
  const lines = changesForClass(changes, sheet.classId).slice(0, 12).map((c) => `• ${c.text}`);
  // The same sentences as the build sheet's banner the mail links to (contracts/edition-words.ts).
  const words = newerEditionLines({
    rulebookTitle: doc.rulebook.title,
    pinnedEdition: published.editions.get(sheet.revisionVersionId) ?? 'an earlier edition',
    newerEdition: doc.rulebook.edition,
    newerStatus: published.status === 'scheduled' ? 'scheduled' : 'published',
    effectiveDate: doc.rulebook.effectiveDate,
    verdictNow: sheet.before,
    verdictUnder: sheet.after,
    className,
  });
  return renderMail({
    subject: `${doc.rulebook.title} ${doc.rulebook.edition}: new pre-check verdict for ${sheet.carName}`,
    greeting: `Hello ${sheet.ownerName},`,
    paragraphs: [
      `${doc.rulebook.publisher} published a new edition. ${words.headline} We checked your build sheet "${sheet.sheetName}" (${sheet.carName}, ${className}) against it.`,
      `${words.pinned} ${words.verdicts}`,
      lines.length > 0 ? `What changed for ${className}:\n${lines.join('\n')}` : '',
      `Open the build sheet to see each finding and what to measure or change. ${words.action}`,
    ],
    action: { label: 'Open the build sheet', url: `${publicUrl.replace(/\/$/, '')}/build-sheets/${sheet.buildSheetId}` },
    reason: 'You get this mail because you keep this build sheet in Cagewright.',
  });
}

/** The mail about one sheet's new verdict under one edition: one row per key, whatever retries happen. */
export function verdictMailKey(versionId: string, buildSheetId: string): string {
  return `verdict.changed:${versionId}:${buildSheetId}`;
}

/**
 * Stores one page in the caller's transaction: the results first (ON CONFLICT DO NOTHING, so a page a
 * dead attempt or a concurrent one already stored is skipped), then, in one statement, a mail for each
 * result that is new here and whose verdict changed, under an idempotency key. Returns how many
 * results were new.
 */
async function storePage(tx: EntityManager, deps: RepublishDeps, jobId: string, versionId: string, page: RecheckedSheet[], published: PublishedDocument, changes: RulesetChange[]): Promise<number> {
  if (page.length === 0) return 0;
  // One multi-row insert per page: 200 sheets in one round trip.
  const values: unknown[] = [];
  const tuples = page.map((s, i) => {
    values.push(jobId, versionId, s.buildSheetId, s.revisionNumber, s.classId, s.storedVerdict, s.after);
    const b = i * 7;
    return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6}, $${b + 7})`;
  });
  const inserted: { build_sheet_id: string }[] = await tx.query(
    `INSERT INTO ruleset_recheck_results (job_id, ruleset_version_id, build_sheet_id, revision_number, class_id, verdict_before, verdict_after)
     VALUES ${tuples.join(', ')} ON CONFLICT (job_id, build_sheet_id) DO NOTHING RETURNING build_sheet_id`,
    values,
  );
  const isNew = new Set(inserted.map((r) => r.build_sheet_id));
  // A sheet never checked before has nothing to change from; only a verdict the builder saw can change.
  const toMail = page.filter((s) => isNew.has(s.buildSheetId) && s.storedVerdict !== null && s.storedVerdict !== s.after);
  // One INSERT for the page's mails (each under its key, so a retry or a concurrent attempt stores none twice).
  const ids = await deps.mail.enqueueMany(
    toMail.map((s) => ({
      mail: { to: s.ownerEmail, kind: 'verdict.changed', related: { buildSheetId: s.buildSheetId, rulesetVersionId: versionId }, ...verdictMail(s, published, changes, deps.publicUrl) },
      idempotencyKey: verdictMailKey(versionId, s.buildSheetId),
    })),
    { manager: tx },
  );
  const sheets = toMail.map((s) => s.buildSheetId);
  const mails = toMail.map((s) => ids.get(verdictMailKey(versionId, s.buildSheetId))!);
  if (sheets.length > 0) {
    await tx.query(
      `UPDATE ruleset_recheck_results r SET mail_id = m.mail_id FROM unnest($2::uuid[], $3::uuid[]) AS m(build_sheet_id, mail_id)
       WHERE r.job_id = $1 AND r.build_sheet_id = m.build_sheet_id`,
      [jobId, sheets, mails],
    );
  }
  return isNew.size;
}

/** What the job has stored so far, over all its attempts. */
async function storedTotals(ds: DataSource | EntityManager, jobId: string): Promise<{ checked: number; changed: number; mailed: number }> {
  const rows: { checked: number; changed: number; mailed: number }[] = await ds.query(
    `SELECT count(*)::int AS checked,
            count(*) FILTER (WHERE verdict_before IS NOT NULL AND verdict_before <> verdict_after)::int AS changed,
            count(mail_id)::int AS mailed
     FROM ruleset_recheck_results WHERE job_id = $1`,
    [jobId],
  );
  return rows[0] ?? { checked: 0, changed: 0, mailed: 0 };
}

export interface RepublishJob {
  id: string;
  data: RepublishJobData;
  progress: Pick<ProgressReporter, 'setTotal' | 'advance'> & Partial<Pick<ProgressReporter, 'resumeFrom'>>;
}

/**
 * Runs one publish job, or resumes it: sheets the job already stored a result for are skipped, so a
 * retry after a crash re-checks each sheet once and mails each builder once, and the completion entry in
 * the activity log is written once. Exported for tests and the bench, which call it without pg-boss.
 */
export async function runRepublish(deps: RepublishDeps, job: RepublishJob): Promise<{ checked: number; failed: number; changed: number; mailed: number }> {
  const current = await publishedDocumentOf(deps.ds, job.data.versionId);
  if (!current) throw new Error('The published version could not be read or is invalid.');
  const previous = job.data.previousVersionId ? await documentOf(deps.ds, job.data.previousVersionId) : null;
  const changes = previous ? describeRulesetChanges(previous.document, current.document) : [];
  const before = await storedTotals(deps.ds, job.id);
  if (before.checked > 0) await job.progress.resumeFrom?.({ done: before.checked });
  const result = await recheckSheets({
    ds: deps.ds,
    rulebookId: current.rulebookId,
    classIds: job.data.classIds,
    version: { id: job.data.versionId, status: current.status, lockVersion: current.lockVersion },
    versionClassIds: current.document.classes.map((c) => c.id),
    evaluator: deps.evaluator,
    skipStoredForJob: job.id,
    ...(deps.batchSize ? { batchSize: deps.batchSize } : {}),
    onTotal: (remaining) => job.progress.setTotal(before.checked + remaining),
    onPage: async (page, failed) => {
      const stored = await deps.ds.transaction((tx) => storePage(tx, deps, job.id, job.data.versionId, page, current, changes));
      await job.progress.advance({ done: stored, failed });
    },
  });
  return deps.ds.transaction(async (tx) => {
    // One completion entry per job, even when two attempts reach this point.
    await tx.query(`SELECT pg_advisory_xact_lock(hashtext($1))`, [`recheck-completed:${job.id}`]);
    const totals = await storedTotals(tx, job.id);
    const logged: unknown[] = await tx.query(
      `SELECT 1 FROM audit_entries WHERE action = 'ruleset.recheck_completed' AND entity_id = $1 AND details->>'jobId' = $2`,
      [job.data.versionId, job.id],
    );
    if (logged.length === 0) {
      await deps.audit.record(
        {
          clubId: current.clubId,
          actorId: null,
          action: 'ruleset.recheck_completed',
          entity: { type: 'ruleset_version', id: job.data.versionId },
          details: { versionNumber: current.versionNumber, jobId: job.id, checked: totals.checked, failed: result.failed, changed: totals.changed, mailed: totals.mailed },
        },
        { manager: tx },
      );
    }
    return { checked: totals.checked, failed: result.failed, changed: totals.changed, mailed: totals.mailed };
  });
}

/** Registers the publish job's worker on pg-boss (server.ts calls this after jobs.start()). */
export async function registerRepublishWorker(jobs: Jobs, deps: RepublishDeps): Promise<void> {
  await jobs.work<RepublishJobData>(republishQueueName, async (job) => {
    const outcome = await runRepublish(deps, job);
    await job.progress.setResult({ kind: 'recheck', ...outcome });
  });
}

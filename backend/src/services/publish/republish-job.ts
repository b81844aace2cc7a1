// The publish job (queue `ruleset.republish`): re-checks every active build sheet of the affected
// classes against the newly published edition, stores each result in ruleset_recheck_results
// (verdict before and after; the builders' own check runs stay as they were) and, for each sheet
// whose verdict changed, puts an e-mail to its builder into the outbox in the same transaction as
// the result. Sending is the outbox dispatcher's: with the SMTP server down the job still completes
// and the mail goes out when it returns.
import type { DataSource, EntityManager } from 'typeorm';
import type { RulesetDocument } from '../../contracts/ruleset';
import { validateRulesetDocument } from '../../domain/rules/validate';
import { describeRulesetChanges, type RulesetChange } from '../../domain/rulebook/diff';
import type { Jobs } from '../jobs';
import { renderMail, type MailService } from '../mail';
import type { AuditService } from '../audit.service';
import type { RulesetService } from '../rulesets.service';
import { republishQueueName, type RepublishJobData } from '../rulebook-admin.service';
import { recheckSheets, type RecheckedSheet } from './recheck';

export interface RepublishDeps {
  ds: DataSource;
  rulesets: RulesetService;
  mail: MailService;
  audit: AuditService;
  publicUrl: string;
  batchSize?: number;
}

const verdictWords = { pass: 'meets the rules', fail: 'does not meet the rules', needs_information: 'needs more measurements' } as const;

async function documentOf(ds: DataSource, id: string): Promise<{ document: RulesetDocument; clubId: string; versionNumber: number; rulebookId: string } | null> {
  const rows: { document: unknown; clubId: string; versionNumber: number; rulebookId: string }[] = await ds.query(
    `SELECT v.document, r.club_id AS "clubId", v.version_number AS "versionNumber", v.rulebook_id AS "rulebookId" FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE v.id = $1`,
    [id],
  );
  const row = rows[0];
  if (!row) return null;
  const v = validateRulesetDocument(row.document);
  return v.ok ? { ...row, document: v.document } : null;
}

/** The changes a builder of `classId` needs to read: those for that class and those for every class. */
export function changesForClass(changes: readonly RulesetChange[], classId: string): RulesetChange[] {
  return changes.filter((c) => (c.classId ? c.classId === classId : c.classIds && c.classIds.length > 0 ? c.classIds.includes(classId) : c.area !== 'rulebook'));
}

function verdictMail(sheet: RecheckedSheet, doc: RulesetDocument, changes: RulesetChange[], publicUrl: string) {
  const className = doc.classes.find((c) => c.id === sheet.classId)?.name ?? sheet.classId;
  const lines = changesForClass(changes, sheet.classId).slice(0, 12).map((c) => `• ${c.text}`);
  const before = sheet.before ? verdictWords[sheet.before] : 'was not checked yet';
  return renderMail({
    subject: `${doc.rulebook.title} ${doc.rulebook.edition}: new pre-check verdict for ${sheet.carName}`,
    greeting: `Hello ${sheet.ownerName},`,
    paragraphs: [
      `${doc.rulebook.publisher} published ${doc.rulebook.title}, edition ${doc.rulebook.edition}, taking effect on ${doc.rulebook.effectiveDate}. We re-checked your build sheet "${sheet.sheetName}" (${sheet.carName}, ${className}) against it.`,
      `Before: ${before}. Now: ${verdictWords[sheet.after]}.`,
      lines.length > 0 ? `What changed for ${className}:\n${lines.join('\n')}` : '',
      'Open the build sheet to see each finding and what to measure or change.',
    ],
    action: { label: 'Open the build sheet', url: `${publicUrl.replace(/\/$/, '')}/build-sheets/${sheet.buildSheetId}` },
    reason: 'You get this mail because you keep this build sheet in Cagewright.',
  });
}

async function storePage(tx: EntityManager, deps: RepublishDeps, jobId: string, versionId: string, page: RecheckedSheet[], doc: RulesetDocument, changes: RulesetChange[]): Promise<number> {
  let mailed = 0;
  const mailIds = new Map<string, string>();
  for (const s of page) {
    // A sheet never checked before has nothing to change from; only a verdict the builder saw can change.
    if (s.storedVerdict === null || s.storedVerdict === s.after) continue;
    const { id } = await deps.mail.enqueue(
      { to: s.ownerEmail, kind: 'verdict.changed', related: { buildSheetId: s.buildSheetId, rulesetVersionId: versionId }, ...verdictMail(s, doc, changes, deps.publicUrl) },
      { manager: tx },
    );
    mailIds.set(s.buildSheetId, id);
    mailed++;
  }
  if (page.length > 0) {
    // One multi-row insert per page: 200 sheets in one round trip.
    const values: unknown[] = [];
    const tuples = page.map((s, i) => {
      values.push(jobId, versionId, s.buildSheetId, s.revisionNumber, s.classId, s.storedVerdict, s.after, mailIds.get(s.buildSheetId) ?? null);
      const b = i * 8;
      return `($${b + 1}, $${b + 2}, $${b + 3}, $${b + 4}, $${b + 5}, $${b + 6}, $${b + 7}, $${b + 8})`;
    });
    await tx.query(
      `INSERT INTO ruleset_recheck_results (job_id, ruleset_version_id, build_sheet_id, revision_number, class_id, verdict_before, verdict_after, mail_id)
       VALUES ${tuples.join(', ')} ON CONFLICT (job_id, build_sheet_id) DO NOTHING`,
      values,
    );
  }
  return mailed;
}

/** Runs one publish job; exported for tests and the bench, which call it without pg-boss. */
export async function runRepublish(
  deps: RepublishDeps,
  job: { id: string; data: RepublishJobData; progress: { setTotal(n: number): Promise<void>; advance(c: { done?: number; failed?: number }): Promise<void> } },
): Promise<{ checked: number; failed: number; changed: number; mailed: number }> {
  const current = await documentOf(deps.ds, job.data.versionId);
  if (!current) throw new Error('The published version could not be read or is invalid.');
  const previous = job.data.previousVersionId ? await documentOf(deps.ds, job.data.previousVersionId) : null;
  const changes = previous ? describeRulesetChanges(previous.document, current.document) : [];
  const compiled = await deps.rulesets.loadCompiled(job.data.versionId);
  let mailed = 0;
  let changed = 0;
  const result = await recheckSheets({
    ds: deps.ds,
    rulebookId: current.rulebookId,
    classIds: job.data.classIds,
    compiled,
    ...(deps.batchSize ? { batchSize: deps.batchSize } : {}),
    onTotal: (n) => job.progress.setTotal(n),
    onPage: async (page, failed) => {
      changed += page.filter((s) => s.storedVerdict !== null && s.storedVerdict !== s.after).length;
      mailed += await deps.ds.transaction((tx) => storePage(tx, deps, job.id, job.data.versionId, page, current.document, changes));
      await job.progress.advance({ done: page.length, failed });
    },
  });
  await deps.audit.record({
    clubId: current.clubId,
    actorId: null,
    action: 'ruleset.recheck_completed',
    entity: { type: 'ruleset_version', id: job.data.versionId },
    details: { versionNumber: current.versionNumber, jobId: job.id, checked: result.checked, failed: result.failed, changed, mailed },
  });
  return { ...result, changed, mailed };
}

/** Registers the publish job's worker on pg-boss (server.ts calls this after jobs.start()). */
export async function registerRepublishWorker(jobs: Jobs, deps: RepublishDeps): Promise<void> {
  await jobs.work<RepublishJobData>(republishQueueName, async (job) => {
    await runRepublish(deps, job);
  });
}

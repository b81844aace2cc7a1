// Rulebook administration for a club's admins: start a draft from the latest edition, autosave it
// (lock versions: a stale save is refused with both versions kept), import and export documents,
// compare two versions in words, run a draft against the club's build sheets (impact: a background
// job with progress, services/publish/impact-job.ts), publish (then a background job re-checks and
// tells builders: services/publish/) and retire. Both re-checks run in the check service's bulk pool.
// An edition dated after the club's today is scheduled and comes into force on its date
// (activateDueEditions, run by the edition clock: services/publish/edition-clock.ts). The life-cycle
// rules are the pure domain's (domain/rulebook/lifecycle.ts); the database trigger backs them up.
// Every change is written with its activity-log entry in one transaction.
import type { DataSource, EntityManager } from 'typeorm';
import type { DocumentProblem, RulesetDocument } from '../contracts/ruleset';
import type {
  CreateRulebookBody,
  DraftConflictDetails,
  ImpactSheetWire,
  ImpactWire,
  ImportDraftBody,
  PublishBody,
  PublishedWire,
  SaveDraftBody,
  SavedDraftWire,
} from '../contracts/rulebook-admin';
import type { RulesetVersionWire } from '../contracts/checks';
import { validateRulesetDocument } from '../domain/rules/validate';
import { TEMPLATE_KINDS } from '../domain/rules/template-kinds';
import { describeRulesetChanges, type RulesetChange } from '../domain/rulebook/diff';
import { activateDueVersions, startDraftFrom, transitionVersion, type RulebookVersion, type StateChange } from '../domain/rulebook/lifecycle';
import { calendarDateIn } from '../domain/dates';
import type { RulesetStatus } from '../entities';
import { AppError, ConflictError, NotFoundError, ValidationError } from '../errors';
import { enforce, rolesIn } from './access';
import type { AuditService } from './audit.service';
import type { RulesetService } from './rulesets.service';
import type { ClubSettingsService } from './club-settings.service';
import { affectedClassIds, recheckSheets, type RecheckEvaluator } from './publish/recheck';

/** Sends background jobs (the publish re-check, the impact); server.ts passes pg-boss, tests may pass their own. */
export interface RepublishQueue {
  send(queue: string, data: RepublishJobData | ImpactJobData, options: { clubId: string; requestedBy: string }): Promise<string>;
}

export const republishQueueName = 'ruleset.republish';
export const impactQueueName = 'ruleset.impact';

export interface RepublishJobData {
  versionId: string;
  previousVersionId: string | null;
  classIds: string[];
}

/** The draft whose impact is wanted, at the lock version the admin looked at. */
export interface ImpactJobData {
  versionId: string;
  lockVersion: number;
}

/** What the impact job reports as it goes (jobs.ts's ProgressReporter). */
export interface ImpactProgress {
  setTotal(total: number): Promise<void>;
  advance(counts: { done?: number; failed?: number }): Promise<void>;
  resumeFrom(counts: { done: number; failed?: number }): Promise<void>;
}

/** An impact asked about a draft that is gone or published: retrying cannot help. */
export class ImpactCannotRunError extends Error {
  override name = 'ImpactCannotRunError';
}

interface VersionRow {
  id: string;
  rulebookId: string;
  versionNumber: number;
  status: RulesetStatus;
  edition: string;
  effectiveDate: string;
  document: unknown;
  publishedAt: Date | null;
  lockVersion: number;
  updatedAt: Date;
  clubId: string;
}

const versionColumns = `v.id, v.rulebook_id AS "rulebookId", v.version_number AS "versionNumber", v.status, v.edition,
  to_char(v.effective_date, 'YYYY-MM-DD') AS "effectiveDate", v.document, v.published_at AS "publishedAt",
  v.lock_version AS "lockVersion", v.updated_at AS "updatedAt", r.club_id AS "clubId"`;

function asLifecycle(v: VersionRow): RulebookVersion {
  return {
    id: v.id,
    rulebookId: v.rulebookId,
    versionNumber: v.versionNumber,
    state: v.status,
    edition: v.edition,
    // A draft's stored date is a placeholder (the column is NOT NULL); publishing always names one.
    effectiveDate: v.status === 'draft' ? null : v.effectiveDate,
    document: v.document,
    publishedAt: v.publishedAt ? v.publishedAt.toISOString() : null,
  };
}

function editionOf(document: unknown, fallback: string): string {
  const rb = (document as { rulebook?: { edition?: unknown } } | null)?.rulebook;
  return typeof rb?.edition === 'string' && rb.edition.trim() !== '' ? rb.edition.trim().slice(0, 200) : fallback;
}

function problemsOf(document: unknown): DocumentProblem[] {
  const v = validateRulesetDocument(document);
  return v.ok ? [] : v.problems;
}

/** A document's problems as a 400, each with its JSON path (`requirements.3.section`). */
function documentInvalid(problems: DocumentProblem[], prefix = ''): ValidationError {
  return new ValidationError(problems.map((p) => ({ path: p.path ? `${prefix}${p.path}` : prefix.replace(/\.$/, '') || '(document)', message: p.message })));
}

function refusal(code: string, message: string, problems?: DocumentProblem[]): AppError {
  if (code === 'invalid_document' && problems) return new ConflictError(message, { problems });
  return new ConflictError(message);
}

const adminsOnly = 'Only the club’s admins keep its rulebooks.';

export type RulebookAdminService = ReturnType<typeof createRulebookAdminService>;

export interface ActivatedEdition {
  versionId: string;
  rulebookId: string;
  versionNumber: number;
  supersededIds: string[];
}

export function createRulebookAdminService(
  ds: DataSource,
  deps: { rulesets: RulesetService; audit: AuditService; clubSettings: ClubSettingsService; now: () => Date; evaluator: RecheckEvaluator; batchSize?: number },
) {
  const { rulesets, audit, clubSettings } = deps;

  /** The version (locked for update inside a transaction when asked); 404 for strangers, 403 for non-admins. */
  async function adminVersion(em: EntityManager, versionId: string, userId: string, lock = false): Promise<VersionRow> {
    const rows: VersionRow[] = await em.query(
      `SELECT ${versionColumns} FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE v.id = $1 ${lock ? 'FOR UPDATE OF v' : ''}`,
      [versionId],
    );
    const row = rows[0];
    if (!row) throw new NotFoundError('Ruleset version not found.');
    const roles = await rolesIn(em, userId, row.clubId);
    enforce('version.admin', { actorId: userId, roles, draft: row.status === 'draft' }, { notFound: 'Ruleset version not found.', forbidden: adminsOnly });
    return row;
  }

  async function siblingsOf(em: EntityManager, rulebookId: string): Promise<VersionRow[]> {
    return em.query(`SELECT ${versionColumns} FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE v.rulebook_id = $1 ORDER BY v.version_number`, [rulebookId]);
  }

  function draftOnly(v: VersionRow): void {
    if (v.status !== 'draft') {
      throw new ConflictError(`Version ${v.versionNumber} is ${v.status}: its content can never change. Start a new draft instead.`);
    }
  }

  function conflict(v: VersionRow): ConflictError {
    const details: DraftConflictDetails = { currentLockVersion: v.lockVersion, currentDocument: v.document, currentUpdatedAt: v.updatedAt.toISOString() };
    return new ConflictError('Someone else saved this draft since you opened it. Both versions are kept: choose which to keep.', details as unknown as Record<string, unknown>);
  }

  async function writeDraft(tx: EntityManager, v: VersionRow, document: unknown, userId: string, action: string, details: Record<string, unknown>): Promise<SavedDraftWire> {
    // TypeORM's postgres driver answers an UPDATE … RETURNING with [rows, affectedCount].
    const [rows]: [{ lockVersion: number; updatedAt: Date }[], number] = await tx.query(
      `UPDATE ruleset_versions SET document = $2::jsonb, edition = $3, lock_version = lock_version + 1, updated_at = now()
       WHERE id = $1 AND status = 'draft' RETURNING lock_version AS "lockVersion", updated_at AS "updatedAt"`,
      [v.id, JSON.stringify(document), editionOf(document, v.edition)],
    );
    const saved = rows[0];
    if (!saved) throw new ConflictError('This draft is no longer a draft.');
    await audit.record({ clubId: v.clubId, actorId: userId, action, entity: { type: 'ruleset_version', id: v.id }, details: { versionNumber: v.versionNumber, lockVersion: saved.lockVersion, ...details } }, { manager: tx });
    return { lockVersion: saved.lockVersion, updatedAt: saved.updatedAt.toISOString(), problems: problemsOf(document) };
  }

  /** Both documents, validated, oldest first. */
  function validDocument(v: VersionRow): RulesetDocument {
    const validation = validateRulesetDocument(v.document);
    if (!validation.ok) {
      throw new ConflictError(`Version ${v.versionNumber} has problems to fix before it can be compared or tried out.`, { problems: validation.problems });
    }
    return validation.document;
  }

  /**
   * Writes status moves in an order the database accepts: supersede and retire first (at most one
   * version in force per rulebook), then the move into force or the schedule.
   */
  async function applyStatusChanges(tx: EntityManager, changes: readonly StateChange[]): Promise<void> {
    const rank = (c: StateChange) => (c.to === 'published' ? 1 : 0);
    for (const c of [...changes].sort((a, b) => rank(a) - rank(b))) {
      if (c.to === 'deleted') continue;
      await tx.query(`UPDATE ruleset_versions SET status = $2 WHERE id = $1 AND status = $3`, [c.versionId, c.to, c.from]);
    }
  }

  /**
   * The version a draft is measured against: the newest edition in force or scheduled (the one it
   * follows), else the newest non-draft.
   */
  function baselineOf(siblings: VersionRow[], except: string): VersionRow | undefined {
    const others = siblings.filter((s) => s.id !== except && s.status !== 'draft').sort((a, b) => b.versionNumber - a.versionNumber);
    return others.find((s) => s.status === 'published' || s.status === 'scheduled') ?? others[0];
  }

  function classesConcerned(changes: RulesetChange[], doc: RulesetDocument): string[] {
    return affectedClassIds(changes, doc.classes.map((c) => c.id));
  }

  /**
   * The starting document of a blank rulebook: one class and the registry's starter tube table, whose
   * section is empty and whose one size is 0 × 0, so it cannot be put in force until both are filled in.
   */
  function blankDocument(body: Extract<CreateRulebookBody, { start: 'blank' }>, today: string): Record<string, unknown> {
    const starter = structuredClone(TEMPLATE_KINDS.tube_table.starter);
    return {
      formatVersion: 1,
      rulebook: { publisher: body.publisher, title: body.title, edition: body.edition, effectiveDate: today },
      unitSystem: body.unitSystem,
      measurementTolerance: {},
      acceptPrintedEquivalents: false,
      printedEquivalents: [],
      classes: [{ id: 'class-1', name: 'First class', weightBasis: 'with_driver' }],
      requirements: [{ id: 'tubes-1', title: starter.label, section: '', severity: 'mandatory', area: starter.area, scope: starter.scope, requires: starter.requires, explanation: '' }],
    };
  }

  /** A slug of the title, unique in the club (`-2`, `-3` … when taken). */
  async function freeSlug(tx: EntityManager, clubId: string, title: string): Promise<string> {
    const base = title.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 70) || 'rulebook';
    const taken = new Set(((await tx.query(`SELECT slug FROM rulebooks WHERE club_id = $1 AND slug LIKE $2`, [clubId, `${base}%`])) as { slug: string }[]).map((r) => r.slug));
    let slug = base;
    for (let n = 2; taken.has(slug); n++) slug = `${base}-${n}`;
    return slug;
  }

  return {
    /**
     * A new rulebook of the club with its first version as a draft: blank, or a ruleset file (a bad
     * file is refused at its paths and nothing is created). The title must not be one the club has.
     */
    async createRulebook(clubId: string, userId: string, body: CreateRulebookBody): Promise<RulesetVersionWire> {
      let document: Record<string, unknown>;
      const today = new Date().toISOString().slice(0, 10);
      if (body.start === 'file') {
        const validation = validateRulesetDocument(body.text);
        if (!validation.ok) throw documentInvalid(validation.problems, 'text.');
        document = validation.document as unknown as Record<string, unknown>;
      } else {
        document = blankDocument(body, today);
      }
      const book = (document as { rulebook: { title: string; publisher: string; edition: string; effectiveDate?: string } }).rulebook;
      const id = await ds.transaction(async (tx) => {
        // Serialises creations in the club, so two admins cannot both take the same title.
        await tx.query(`SELECT id FROM clubs WHERE id = $1 FOR UPDATE`, [clubId]);
        const same: unknown[] = await tx.query(`SELECT 1 FROM rulebooks WHERE club_id = $1 AND lower(title) = lower($2)`, [clubId, book.title]);
        if (same.length > 0) {
          const path = body.start === 'blank' ? 'title' : 'text.rulebook.title';
          throw new ValidationError([{ path, message: `The club already has a rulebook called “${book.title}”. Start a new edition of it instead, or choose another title.` }]);
        }
        const [created] = (await tx.query(
          `INSERT INTO rulebooks (club_id, slug, title, publisher) VALUES ($1, $2, $3, $4) RETURNING id`,
          [clubId, await freeSlug(tx, clubId, book.title), book.title, book.publisher],
        )) as { id: string }[];
        const rows: { id: string }[] = await tx.query(
          `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document, created_by)
           VALUES ($1, 1, 'draft', $2, $3, $4::jsonb, $5) RETURNING id`,
          [created!.id, book.edition, /^\d{4}-\d{2}-\d{2}$/.test(book.effectiveDate ?? '') ? book.effectiveDate : today, JSON.stringify(document), userId],
        );
        const versionId = rows[0]!.id;
        await audit.record(
          {
            clubId, actorId: userId, action: 'ruleset.rulebook_created', entity: { type: 'ruleset_version', id: versionId },
            details: { rulebookId: created!.id, rulebookTitle: book.title, versionNumber: 1, edition: book.edition, fromFile: body.start === 'file' },
          },
          { manager: tx },
        );
        return versionId;
      });
      return rulesets.getVersion(id, userId);
    },

    /** A new draft copied from the rulebook's newest version (one open draft per rulebook). */
    async createDraft(rulebookId: string, userId: string): Promise<RulesetVersionWire> {
      const id = await ds.transaction(async (tx) => {
        const books: { clubId: string }[] = await tx.query(`SELECT club_id AS "clubId" FROM rulebooks WHERE id = $1 FOR UPDATE`, [rulebookId]);
        const book = books[0];
        if (!book) throw new NotFoundError('Rulebook not found.');
        enforce('rulebook.admin', { actorId: userId, roles: await rolesIn(tx, userId, book.clubId) }, { notFound: 'Rulebook not found.', forbidden: adminsOnly });
        const siblings = await siblingsOf(tx, rulebookId);
        const latest = [...siblings].filter((s) => s.status !== 'draft').sort((a, b) => b.versionNumber - a.versionNumber)[0] ?? siblings[siblings.length - 1];
        if (!latest) throw new ConflictError('This rulebook has no version to start from; import a document into a new rulebook instead.');
        const draft = startDraftFrom(asLifecycle(latest), siblings.map(asLifecycle));
        if ('ok' in draft) throw new ConflictError(draft.message);
        const rows: { id: string }[] = await tx.query(
          `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document, created_by)
           VALUES ($1, $2, 'draft', $3, $4, $5::jsonb, $6) RETURNING id`,
          [rulebookId, draft.versionNumber, draft.edition, latest.effectiveDate, JSON.stringify(draft.document), userId],
        );
        const newId = rows[0]!.id;
        await audit.record({ clubId: book.clubId, actorId: userId, action: 'ruleset.draft_started', entity: { type: 'ruleset_version', id: newId }, details: { rulebookId, versionNumber: draft.versionNumber, copiedFrom: latest.versionNumber, edition: draft.edition } }, { manager: tx });
        return newId;
      });
      return rulesets.getVersion(id, userId);
    },

    /** Autosave: refused with 409 (the server's document in details) when `lockVersion` is stale. */
    async saveDraft(versionId: string, userId: string, body: SaveDraftBody): Promise<SavedDraftWire> {
      return ds.transaction(async (tx) => {
        const v = await adminVersion(tx, versionId, userId, true);
        draftOnly(v);
        if (v.lockVersion !== body.lockVersion) throw conflict(v);
        return writeDraft(tx, v, body.document, userId, 'ruleset.draft_saved', {});
      });
    },

    /** Replaces a draft's document with an imported file; bad JSON or a bad document changes nothing. */
    async importDraft(versionId: string, userId: string, body: ImportDraftBody): Promise<SavedDraftWire> {
      // The contract parsed the file's JSON (a bad one is a 400 at `text` already).
      const parsed = body.text;
      const validation = validateRulesetDocument(parsed);
      if (!validation.ok) throw documentInvalid(validation.problems, 'document.');
      return ds.transaction(async (tx) => {
        const v = await adminVersion(tx, versionId, userId, true);
        draftOnly(v);
        if (v.lockVersion !== body.lockVersion) throw conflict(v);
        return writeDraft(tx, v, validation.document, userId, 'ruleset.imported', { requirementCount: validation.document.requirements.length });
      });
    },

    async deleteDraft(versionId: string, userId: string): Promise<void> {
      await ds.transaction(async (tx) => {
        const v = await adminVersion(tx, versionId, userId, true);
        const done = transitionVersion(asLifecycle(v), { type: 'delete' }, { siblings: [], now: new Date().toISOString() });
        if (!done.ok) throw refusal(done.code, done.message);
        await tx.query(`DELETE FROM ruleset_versions WHERE id = $1 AND status = 'draft'`, [v.id]);
        // The version is gone: the entry keeps the rulebook's title so the log can still name it.
        const [book] = (await tx.query(`SELECT title FROM rulebooks WHERE id = $1`, [v.rulebookId])) as { title: string }[];
        await audit.record({ clubId: v.clubId, actorId: userId, action: 'ruleset.draft_deleted', entity: { type: 'ruleset_version', id: v.id }, details: { versionNumber: v.versionNumber, edition: v.edition, rulebookTitle: book?.title ?? null } }, { manager: tx });
      });
    },

    /** What changed from `otherId` to `versionId` (older first, whichever order they are given in). */
    async compare(versionId: string, otherId: string, userId: string): Promise<{ from: number; to: number; changes: RulesetChange[] }> {
      const [a, b] = await Promise.all([adminVersion(ds.manager, versionId, userId), adminVersion(ds.manager, otherId, userId)]);
      if (a.rulebookId !== b.rulebookId) throw new NotFoundError('Ruleset version not found.');
      const [older, newer] = a.versionNumber <= b.versionNumber ? [a, b] : [b, a];
      return { from: older.versionNumber, to: newer.versionNumber, changes: describeRulesetChanges(validDocument(older), validDocument(newer)) };
    },

    /**
     * Queues the draft's impact on the club's build sheets (a background job: GET /api/jobs/:id shows
     * its progress and, once done, the result). Refusals (404, 403, a published version, a document
     * with problems) come at once; the work does not.
     */
    async startImpact(versionId: string, userId: string, queue: RepublishQueue | null): Promise<string> {
      const v = await adminVersion(ds.manager, versionId, userId);
      draftOnly(v);
      validDocument(v);
      if (!queue) throw new ConflictError('Background jobs are not running on this server, so the impact cannot be worked out.');
      return queue.send(impactQueueName, { versionId: v.id, lockVersion: v.lockVersion } satisfies ImpactJobData, { clubId: v.clubId, requestedBy: userId });
    },

    /**
     * The impact job's work: the draft (as it is now; the result names its lock version) against every
     * active build sheet of the classes its changes concern, in the bulk pool. Nothing is stored but the
     * summary the job keeps. A retry starts again from the first sheet.
     */
    async computeImpact(data: ImpactJobData, progress: ImpactProgress, attempt = 1): Promise<ImpactWire> {
      const rows: VersionRow[] = await ds.query(`SELECT ${versionColumns} FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE v.id = $1`, [data.versionId]);
      const v = rows[0];
      if (!v) throw new ImpactCannotRunError('The draft was deleted before its impact was worked out.');
      if (v.status !== 'draft') throw new ImpactCannotRunError(`Version ${v.versionNumber} is ${v.status} now; its impact as a draft is no longer worked out.`);
      const validation = validateRulesetDocument(v.document);
      if (!validation.ok) throw new ImpactCannotRunError('The draft has problems to fix before it can be tried out.');
      const doc = validation.document;
      const baseline = baselineOf(await siblingsOf(ds.manager, v.rulebookId), v.id);
      const classIds = baseline ? classesConcerned(describeRulesetChanges(validDocument(baseline), doc), doc) : doc.classes.map((c) => c.id);
      if (attempt > 1) await progress.resumeFrom({ done: 0, failed: 0 });
      const counts = { passToFail: 0, failToPass: 0, unchanged: 0, needsInformationChanged: 0, otherChanged: 0 };
      const changed: ImpactSheetWire[] = [];
      const { checked, failed } = await recheckSheets({
        ds,
        rulebookId: v.rulebookId,
        classIds,
        version: { id: v.id, status: v.status, lockVersion: v.lockVersion },
        versionClassIds: doc.classes.map((c) => c.id),
        evaluator: deps.evaluator,
        withBefore: true,
        ...(deps.batchSize ? { batchSize: deps.batchSize } : {}),
        onTotal: (total) => progress.setTotal(total),
        onPage: async (sheets, failedHere) => {
          for (const s of sheets) {
            const before = s.before;
            if (before === s.after) {
              counts.unchanged++;
              continue;
            }
            if (before === 'pass' && s.after === 'fail') counts.passToFail++;
            else if (before === 'fail' && s.after === 'pass') counts.failToPass++;
            else if (before === 'needs_information' || s.after === 'needs_information') counts.needsInformationChanged++;
            else counts.otherChanged++;
            changed.push({ buildSheetId: s.buildSheetId, sheetName: s.sheetName, carName: s.carName, builder: { id: s.ownerId, displayName: s.ownerName }, classId: s.classId, before, after: s.after });
          }
          await progress.advance({ done: sheets.length, failed: failedHere });
        },
      });
      return { versionId: v.id, lockVersion: v.lockVersion, classIds, checked, failed, counts, changed };
    },

    /**
     * Publishes the draft and queues the re-check of the sheets. Dated today or earlier in the club's
     * time zone it is in force at once (the edition before it is superseded); dated later it is
     * scheduled, and the edition in force stays so until the date comes.
     */
    async publish(versionId: string, userId: string, body: PublishBody, queue: RepublishQueue | null): Promise<PublishedWire> {
      const outcome = await ds.transaction(async (tx) => {
        const v = await adminVersion(tx, versionId, userId, true);
        draftOnly(v);
        if (v.lockVersion !== body.lockVersion) throw conflict(v);
        // The rulebook row serialises publishing with the edition clock.
        await tx.query(`SELECT id FROM rulebooks WHERE id = $1 FOR UPDATE`, [v.rulebookId]);
        const siblings = await siblingsOf(tx, v.rulebookId);
        const { today } = await clubSettings.calendar(v.clubId, tx);
        const done = transitionVersion(asLifecycle(v), { type: 'publish', effectiveDate: body.effectiveDate }, { siblings: siblings.map(asLifecycle), now: new Date().toISOString(), today });
        if (!done.ok) throw refusal(done.code, done.message, done.problems);
        const published = done.version!;
        const previous = baselineOf(siblings, v.id);
        // Supersede first: at most one published version per rulebook (a unique index).
        await applyStatusChanges(tx, done.changes.slice(1));
        await tx.query(
          `UPDATE ruleset_versions SET status = $6, document = $2::jsonb, edition = $3, effective_date = $4, published_at = now(), published_by = $5 WHERE id = $1`,
          [v.id, JSON.stringify(published.document), published.edition, published.effectiveDate, userId, published.state],
        );
        const doc = published.document as RulesetDocument;
        const classIds = previous ? classesConcerned(describeRulesetChanges(validDocument(previous), doc), doc) : doc.classes.map((c) => c.id);
        const wasInForce = done.changes.slice(1).find((c) => c.from === 'published');
        const supersededVersion = wasInForce ? (siblings.find((s) => s.id === wasInForce.versionId)?.versionNumber ?? null) : null;
        await audit.record({ clubId: v.clubId, actorId: userId, action: published.state === 'scheduled' ? 'ruleset.scheduled' : 'ruleset.published', entity: { type: 'ruleset_version', id: v.id }, details: { versionNumber: v.versionNumber, edition: published.edition, effectiveDate: published.effectiveDate, supersededVersion, classIds } }, { manager: tx });
        return { v, classIds, previousId: previous?.id ?? null, state: published.state as 'published' | 'scheduled', effectiveDate: published.effectiveDate! };
      });
      // pg-boss has its own connections, so the job is sent once the publish is committed.
      const jobId = queue
        ? await queue.send(republishQueueName, { versionId, previousVersionId: outcome.previousId, classIds: outcome.classIds }, { clubId: outcome.v.clubId, requestedBy: userId })
        : null;
      return { versionId, jobId, classIds: outcome.classIds, status: outcome.state, effectiveDate: outcome.effectiveDate };
    },

    /**
     * Brings every scheduled edition whose date has come (midnight in its club's time zone) into
     * force, superseding the one before. Idempotent and safe to run from several servers at once: each
     * rulebook is locked and looked at again inside its own transaction.
     */
    async activateDueEditions(at: Date = deps.now()): Promise<ActivatedEdition[]> {
      const candidates: { rulebookId: string }[] = await ds.query(
        `SELECT DISTINCT v.rulebook_id AS "rulebookId" FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id JOIN clubs c ON c.id = r.club_id
         WHERE v.status = 'scheduled' AND v.effective_date <= ($1::timestamptz AT TIME ZONE c.time_zone)::date`,
        [at.toISOString()],
      );
      const activated: ActivatedEdition[] = [];
      for (const { rulebookId } of candidates) {
        const done = await ds.transaction(async (tx) => {
          const books: { clubId: string; timeZone: string }[] = await tx.query(
            `SELECT r.club_id AS "clubId", c.time_zone AS "timeZone" FROM rulebooks r JOIN clubs c ON c.id = r.club_id WHERE r.id = $1 FOR UPDATE OF r`,
            [rulebookId],
          );
          const book = books[0];
          if (!book) return null;
          const siblings = await siblingsOf(tx, rulebookId);
          const changes = activateDueVersions(siblings.map(asLifecycle), calendarDateIn(at, book.timeZone));
          const into = changes.find((c) => c.to === 'published');
          if (!into) return null;
          await applyStatusChanges(tx, changes);
          const v = siblings.find((s) => s.id === into.versionId)!;
          const supersededIds = changes.filter((c) => c.to === 'superseded').map((c) => c.versionId);
          await audit.record(
            { clubId: book.clubId, actorId: null, action: 'ruleset.in_force', entity: { type: 'ruleset_version', id: v.id }, details: { versionNumber: v.versionNumber, edition: v.edition, effectiveDate: v.effectiveDate, supersededVersions: siblings.filter((s) => supersededIds.includes(s.id)).map((s) => s.versionNumber) } },
            { manager: tx },
          );
          return { versionId: v.id, rulebookId, versionNumber: v.versionNumber, supersededIds };
        });
        if (done) activated.push(done);
      }
      return activated;
    },

    async retire(versionId: string, userId: string): Promise<RulesetVersionWire> {
      await ds.transaction(async (tx) => {
        const v = await adminVersion(tx, versionId, userId, true);
        const done = transitionVersion(asLifecycle(v), { type: 'retire' }, { siblings: [], now: new Date().toISOString() });
        if (!done.ok) throw refusal(done.code, done.message);
        await tx.query(`UPDATE ruleset_versions SET status = 'retired' WHERE id = $1`, [v.id]);
        await audit.record({ clubId: v.clubId, actorId: userId, action: 'ruleset.retired', entity: { type: 'ruleset_version', id: v.id }, details: { versionNumber: v.versionNumber, edition: v.edition, from: v.status } }, { manager: tx });
      });
      return rulesets.getVersion(versionId, userId);
    },

    /** The document in the rulesets/ format, with a file name of the rulebook and edition. */
    async exportVersion(versionId: string, userId: string): Promise<{ fileName: string; json: string }> {
      const v = await adminVersion(ds.manager, versionId, userId);
      const slugRows: { slug: string }[] = await ds.query(`SELECT slug FROM rulebooks WHERE id = $1`, [v.rulebookId]);
      const edition = v.edition.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || `v${v.versionNumber}`;
      const draftMark = v.status === 'draft' ? `-draft-${v.versionNumber}` : '';
      return { fileName: `${slugRows[0]?.slug ?? 'rulebook'}-${edition}${draftMark}.json`, json: `${JSON.stringify(v.document, null, 2)}\n` };
    },
  };
}

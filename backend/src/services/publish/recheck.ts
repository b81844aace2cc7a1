// Re-checking stored build sheets against a ruleset version: the heart of both the impact job (a
// draft, nothing stored but the summary) and the publish job (the new edition, results stored and
// builders told). Sheets are read in pages of `batchSize` by id (keyset paging, so 10,000 sheets never
// sit in memory at once). Each page goes to the evaluator at once: normally the check service's bulk
// pool of worker threads, one per core, so the server's main thread only reads pages, routes
// messages and stores results while the cores compute (the specification travels as the JSON text
// PostgreSQL returns and is parsed in the worker). The next page is read and queued while this one is
// evaluated, and a page is stored while the next is evaluated, so the workers seldom wait.
import type { DataSource } from 'typeorm';
import type { Verdict } from '../../contracts/rulebook-admin';
import type { CacheKeyParts } from '../compiled-ruleset-cache';
import { CheckEngineUnavailableError, type VerdictJob } from '../check-engine';

export interface SheetToRecheck {
  buildSheetId: string;
  sheetName: string;
  carName: string;
  ownerId: string;
  ownerName: string;
  ownerEmail: string;
  classId: string;
  revisionNumber: number;
  /** The verdict the builder last saw: the sheet's latest check when it is of the current revision. */
  storedVerdict: Verdict | null;
  /** The ruleset version the revision names. */
  revisionVersionId: string;
}

export interface RecheckedSheet extends SheetToRecheck {
  /** The verdict before: the stored one, else (with `withBefore`) the revision checked against the version it names. */
  before: Verdict | null;
  after: Verdict;
}

/** What evaluates a stored specification: the check service's bulk pool, or one thread. */
export interface RecheckEvaluator {
  verdict(job: VerdictJob): Promise<Verdict>;
}

export interface RecheckOptions {
  ds: DataSource;
  rulebookId: string;
  classIds: readonly string[];
  /** The version every sheet is checked against. */
  version: CacheKeyParts;
  /** The classes that version defines; sheets of other classes are not checked. */
  versionClassIds: readonly string[];
  evaluator: RecheckEvaluator;
  /** A sheet with no up-to-date stored verdict is also checked against its revision's own version. */
  withBefore?: boolean;
  batchSize?: number;
  /** Called once with the number of sheets, before the first page. */
  onTotal?: (total: number) => Promise<void> | void;
  /** Called with each page's results (store them, count them, mail about them). */
  onPage: (page: RecheckedSheet[], failed: number) => Promise<void> | void;
  /** Skip the sheets this publish job already stored a result for (a resumed job continues). */
  skipStoredForJob?: string;
}

interface SheetRow {
  id: string;
  sheet_name: string;
  car_name: string;
  owner_id: string;
  owner_name: string;
  owner_email: string;
  class_id: string;
  revision_number: number;
  stored_verdict: Verdict | null;
  revision_version_id: string;
  specification_json: string;
}

const sheetFilter = `s.archived_at IS NULL AND s.rulebook_id = $1 AND s.class_id = ANY($2::text[])`;
const notStored = (param: string) =>
  `(${param}::uuid IS NULL OR NOT EXISTS (SELECT 1 FROM ruleset_recheck_results x WHERE x.job_id = ${param}::uuid AND x.build_sheet_id = s.id))`;

/** Active sheets of the rulebook in those classes (by their latest revision), less those the job stored. */
export async function countSheets(ds: DataSource, rulebookId: string, classIds: readonly string[], skipStoredForJob: string | null = null): Promise<number> {
  const rows: { n: string }[] = await ds.query(`SELECT count(*) AS n FROM build_sheets s WHERE ${sheetFilter} AND ${notStored('$3')}`, [rulebookId, classIds, skipStoredForJob]);
  return Number(rows[0]?.n ?? 0);
}

async function page(ds: DataSource, rulebookId: string, classIds: readonly string[], afterId: string | null, limit: number, skipStoredForJob: string | null): Promise<SheetRow[]> {
  // The specification as text: the worker parses it, the main thread only passes it on.
  return ds.query(
    `SELECT s.id, s.name AS sheet_name, c.name AS car_name, u.id AS owner_id, u.display_name AS owner_name, u.email AS owner_email,
            r.class_id, r.number AS revision_number, r.ruleset_version_id AS revision_version_id,
            CASE WHEN s.latest_checked_revision = s.current_revision THEN s.latest_verdict END AS stored_verdict,
            r.specification::text AS specification_json
     FROM build_sheets s
     JOIN build_sheet_revisions r ON r.build_sheet_id = s.id AND r.number = s.current_revision
     JOIN cars c ON c.id = s.car_id
     JOIN users u ON u.id = c.owner_id
     WHERE ${sheetFilter} AND ($3::uuid IS NULL OR s.id > $3::uuid) AND ${notStored('$5')}
     ORDER BY s.id LIMIT $4`,
    [rulebookId, classIds, afterId, limit, skipStoredForJob],
  );
}

/** Evaluates every matching sheet; a sheet that cannot be evaluated counts as failed, the rest go on. */
export async function recheckSheets(options: RecheckOptions): Promise<{ checked: number; failed: number }> {
  const { ds, rulebookId, classIds, evaluator, version } = options;
  const batchSize = options.batchSize ?? 200;
  const inVersion = new Set(options.versionClassIds);
  const known = classIds.filter((id) => inVersion.has(id));
  const skip = options.skipStoredForJob ?? null;
  await options.onTotal?.(known.length === 0 ? 0 : await countSheets(ds, rulebookId, known, skip));
  let checked = 0;
  let failedTotal = 0;
  if (known.length === 0) return { checked, failed: failedTotal };

  // The version each revision names, as a cache key (for the verdict before, with `withBefore`).
  const keys = new Map<string, Promise<CacheKeyParts | null>>();
  const keyOf = (id: string): Promise<CacheKeyParts | null> => {
    let k = keys.get(id);
    if (!k) {
      k = ds
        .query(`SELECT id, status, lock_version AS "lockVersion" FROM ruleset_versions WHERE id = $1`, [id])
        .then((rows: CacheKeyParts[]) => rows[0] ?? null);
      keys.set(id, k);
    }
    return k;
  };

  async function evaluate(row: SheetRow): Promise<RecheckedSheet | null> {
    try {
      const job = { classId: row.class_id, specificationJson: row.specification_json };
      let before: Promise<Verdict | null> = Promise.resolve(row.stored_verdict);
      if (row.stored_verdict === null && options.withBefore) {
        before = keyOf(row.revision_version_id).then((k) => (k ? evaluator.verdict({ ...job, version: k }) : null));
      }
      const [after, was] = await Promise.all([evaluator.verdict({ ...job, version }), before]);
      return {
        buildSheetId: row.id,
        sheetName: row.sheet_name,
        carName: row.car_name,
        ownerId: row.owner_id,
        ownerName: row.owner_name,
        ownerEmail: row.owner_email,
        classId: row.class_id,
        revisionNumber: row.revision_number,
        storedVerdict: row.stored_verdict,
        revisionVersionId: row.revision_version_id,
        before: was,
        after,
      };
    } catch (err) {
      // The pool went away (shutdown, a dead thread): this attempt stops and is retried; nothing is
      // known about the sheet, so it must not be counted as one that cannot be evaluated.
      if (err instanceof CheckEngineUnavailableError) throw err;
      return null;
    }
  }

  async function evaluatePage(rows: SheetRow[]): Promise<{ results: RecheckedSheet[]; failed: number }> {
    const all = await Promise.all(rows.map(evaluate));
    const results = all.filter((r): r is RecheckedSheet => r !== null);
    return { results, failed: all.length - results.length };
  }

  // Two pages in flight: the next page's sheets join the pool's queue as soon as they are read, so
  // the workers never drain between pages (a page's last few sheets would otherwise leave a core idle
  // while the slowest worker finishes), and a page is stored while the next one is evaluated.
  let rows = await page(ds, rulebookId, known, null, batchSize, skip);
  let evaluating = rows.length > 0 ? evaluatePage(rows) : null;
  while (evaluating) {
    // A short page is the last one: no query for an empty page after it.
    let nextRows: SheetRow[] = [];
    if (rows.length === batchSize) {
      try {
        nextRows = await page(ds, rulebookId, known, rows[rows.length - 1]!.id, batchSize, skip);
      } catch (err) {
        // This page's evaluation is abandoned with the attempt; it must not become an unhandled rejection.
        evaluating.catch(() => undefined);
        throw err;
      }
    }
    const next = nextRows.length > 0 ? evaluatePage(nextRows) : null;
    next?.catch(() => undefined);
    const done = await evaluating;
    checked += done.results.length;
    failedTotal += done.failed;
    // Stored while the workers evaluate the next page.
    await options.onPage(done.results, done.failed);
    rows = nextRows;
    evaluating = next;
  }
  return { checked, failed: failedTotal };
}

/** Which classes a change list concerns: the classes it names, or every class when a change names none. */
export function affectedClassIds(
  changes: readonly { classId?: string; classIds?: string[]; area: string }[],
  allClassIds: readonly string[],
): string[] {
  const named = new Set<string>();
  for (const c of changes) {
    if (c.classId) named.add(c.classId);
    else if (c.classIds && c.classIds.length > 0) c.classIds.forEach((id) => named.add(id));
    // A rulebook-wide change (policy, tolerance, a requirement for every class) touches them all.
    else if (c.area !== 'rulebook') return [...allClassIds];
  }
  return allClassIds.filter((id) => named.has(id));
}

// Re-checking stored build sheets against a ruleset version: the heart of both the impact panel
// (a draft, nothing stored) and the publish job (the new edition, results stored and builders told).
// Sheets are read in pages of `batchSize` by id (keyset paging, so 10,000 sheets never sit in memory
// at once), each page evaluated with the version compiled once (the compiled-ruleset cache), and the
// event loop is given back between pages and every few evaluations so the web server keeps answering.
import { setImmediate as yieldToLoop } from 'node:timers/promises';
import type { DataSource } from 'typeorm';
import type { Specification } from '../../contracts/specification';
import type { Verdict } from '../../contracts/rulebook-admin';
import { evaluateSpecification, type CompiledRuleset } from '../../domain';

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
  specification: Specification;
}

export interface RecheckedSheet extends SheetToRecheck {
  /** The verdict before: the stored one, else the revision checked against the version it names. */
  before: Verdict | null;
  after: Verdict;
}

export interface RecheckOptions {
  ds: DataSource;
  rulebookId: string;
  classIds: readonly string[];
  compiled: CompiledRuleset;
  /** When given, a sheet with no up-to-date stored verdict is also checked against its own version. */
  beforeFor?: (versionId: string) => Promise<CompiledRuleset>;
  batchSize?: number;
  /** Evaluations between two yields to the event loop inside a page. */
  yieldEvery?: number;
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
  specification: Specification;
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
  return ds.query(
    `SELECT s.id, s.name AS sheet_name, c.name AS car_name, u.id AS owner_id, u.display_name AS owner_name, u.email AS owner_email,
            r.class_id, r.number AS revision_number, r.ruleset_version_id AS revision_version_id,
            CASE WHEN s.latest_checked_revision = s.current_revision THEN s.latest_verdict END AS stored_verdict,
            r.specification
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
  const { ds, rulebookId, classIds, compiled } = options;
  const batchSize = options.batchSize ?? 200;
  const yieldEvery = options.yieldEvery ?? 20;
  const known = classIds.filter((id) => compiled.classes[id] !== undefined);
  const skip = options.skipStoredForJob ?? null;
  await options.onTotal?.(known.length === 0 ? 0 : await countSheets(ds, rulebookId, known, skip));
  let checked = 0;
  let failedTotal = 0;
  let afterId: string | null = null;
  if (known.length === 0) return { checked, failed: failedTotal };
  for (;;) {
    const rows = await page(ds, rulebookId, known, afterId, batchSize, skip);
    if (rows.length === 0) break;
    const results: RecheckedSheet[] = [];
    let failed = 0;
    for (let i = 0; i < rows.length; i++) {
      const row = rows[i]!;
      try {
        const report = await evaluateSpecification(compiled, row.class_id, row.specification);
        let before: Verdict | null = row.stored_verdict;
        if (before === null && options.beforeFor) {
          before = (await evaluateSpecification(await options.beforeFor(row.revision_version_id), row.class_id, row.specification)).verdict;
        }
        results.push({
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
          specification: row.specification,
          before,
          after: report.verdict,
        });
      } catch {
        failed++;
      }
      if ((i + 1) % yieldEvery === 0) await yieldToLoop();
    }
    checked += results.length;
    failedTotal += failed;
    await options.onPage(results, failed);
    afterId = rows[rows.length - 1]!.id;
    await yieldToLoop();
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

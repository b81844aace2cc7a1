// Republish bench: 10,000 stored build sheets re-checked after a publish, database included.
// A fresh bench database in the test cluster (`cagewright_bench_republish`) is migrated and seeded
// with the demo, then 10,000 saloon sheets are bulk-inserted in SQL (half of them with 0.095 in
// hoop walls, half with 0.120 in; every one stored as passing). A draft raising the saloon tube
// table to 0.120 in walls is published through the service, and the publish job's handler runs as
// pg-boss would run it: pages of 200 sheets, one compilation of the edition (the compiled-ruleset
// cache), results stored page by page and a mail queued for each sheet whose verdict changed.
// Reports sheets/s, total time (target under 20 s) and the event-loop delay while it ran, which is
// what other requests to the same process would wait.
//   npx tsx --tsconfig tsconfig.json tests/bench/republish.ts
import { randomUUID } from 'node:crypto';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { freshSeededDatabase } from './bench-db';

const benchDb = 'cagewright_bench_republish';
export const REPUBLISH_TARGET_SECONDS = 20;

export interface RepublishBenchResult {
  sheets: number;
  seconds: number;
  sheetsPerSecond: number;
  changed: number;
  mailed: number;
  failed: number;
  eventLoopDelayP99Ms: number;
  eventLoopDelayMaxMs: number;
  seedSeconds: number;
  pass: boolean;
}

const hoop = (wallMm: number) => ({ odMm: 44.45, wallMm, material: 'mild_steel', process: 'dom', bends: [] });
/** The demo saloon (1.750 in hoops, F-UNIT-1: 1 in = 25.4 mm), complete enough to pass the demo rules. */
function saloon(wallMm: number) {
  const bar = { odMm: 38.1, wallMm: 2.413, material: 'mild_steel', process: 'dom', bends: [] };
  return {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 1200, chassis: 'unibody', cockpit: 'closed' },
    members: [
      { id: 'mh', kind: 'main_hoop', ...hoop(wallMm), lengthMm: 3350, continuousPiece: true },
      { id: 'fh', kind: 'front_hoop', ...hoop(wallMm), lengthMm: 3900 },
      { id: 'rb-l', kind: 'rear_brace', ...hoop(wallMm), lengthMm: 1150 },
      { id: 'rb-r', kind: 'rear_brace', ...hoop(wallMm), lengthMm: 1150 },
      { id: 'hb', kind: 'harness_bar', ...bar, lengthMm: 1180 },
      { id: 'db-l', kind: 'door_bar', ...bar, lengthMm: 1020 },
      { id: 'db-r', kind: 'door_bar', ...bar, lengthMm: 1020 },
      { id: 'dg', kind: 'diagonal', ...bar },
    ],
    geometry: { rearBraceAttachBelowTopMm: 100, rearBraceAngleFromVerticalDeg: 38, helmetBelowHoopLineMm: 50, harnessBarBelowShouldersMm: 40 },
    padding: { nearHelmet: true, standard: 'sfi_45_1' },
    welding: { process: 'mig' },
  };
}

interface TubeReq {
  id: string;
  requires: { bands?: { rows: { alternatives: { wall: number }[] }[] }[]; allowances?: { thinWallWhenOdExceedsMinimum?: { minWall: number } } };
}

export async function runRepublishBench(options: { sheets?: number; log?: boolean } = {}): Promise<RepublishBenchResult> {
  const total = options.sheets ?? 10_000;
  const log = options.log ? (m: string) => console.log(`[republish] ${m}`) : () => undefined;
  const { createServices } = await import('../../backend/src/services');
  const { runRepublish } = await import('../../backend/src/services/publish/republish-job');
  const { ds } = await freshSeededDatabase(benchDb, 4);
  try {
    const seedStart = performance.now();
    const [ctx] = await ds.query(
      `SELECT v.id AS "versionId", v.rulebook_id AS "rulebookId", r.club_id AS "clubId",
              (SELECT id FROM users WHERE email = 'builder@tarnwick.example') AS "builderId",
              (SELECT id FROM users WHERE email = 'admin@tarnwick.example') AS "adminId"
       FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id
       WHERE r.slug = 'tarnwick-vale-mc-cage-regulations-2027' AND v.status = 'published'`,
    );
    // 100 cars with total/100 sheets each, one revision per sheet, all in SQL.
    await ds.query(`INSERT INTO cars (owner_id, name, chassis_type) SELECT $1, 'Bench car ' || g, 'unibody' FROM generate_series(1, 100) g`, [ctx.builderId]);
    await ds.query(
      `INSERT INTO build_sheets (car_id, name, club_id, rulebook_id, ruleset_version_id, class_id, current_revision, latest_verdict, latest_checked_revision)
       SELECT c.id, 'Sheet ' || g, $1, $2, $3, 'club-saloon', 1, 'pass', 1
       FROM (SELECT id, row_number() OVER (ORDER BY id) AS n FROM cars WHERE name LIKE 'Bench car %') c, generate_series(1, $4::int) g`,
      [ctx.clubId, ctx.rulebookId, ctx.versionId, Math.ceil(total / 100)],
    );
    await ds.query(
      `INSERT INTO build_sheet_revisions (build_sheet_id, number, specification, ruleset_version_id, class_id, created_by)
       SELECT s.id, 1, CASE WHEN row_number() OVER (ORDER BY s.id) % 2 = 0 THEN $1::jsonb ELSE $2::jsonb END, $3, 'club-saloon', $4
       FROM build_sheets s`,
      [JSON.stringify(saloon(2.413)), JSON.stringify(saloon(3.048)), ctx.versionId, ctx.builderId],
    );
    const [{ n }] = await ds.query(`SELECT count(*)::int AS n FROM build_sheets`);
    const seedSeconds = (performance.now() - seedStart) / 1000;
    log(`seeded ${n} sheets in ${seedSeconds.toFixed(1)} s`);

    const services = createServices(ds, { publicUrl: 'http://127.0.0.1:3000' });
    const draft = await services.rulebookAdmin.createDraft(ctx.rulebookId, ctx.adminId);
    const doc = structuredClone(draft.document) as unknown as { requirements: TubeReq[] };
    const req = doc.requirements.find((r) => r.id === 'tv-saloon-tubes')!;
    for (const band of req.requires.bands ?? []) for (const row of band.rows) for (const alt of row.alternatives) alt.wall = 0.12;
    if (req.requires.allowances?.thinWallWhenOdExceedsMinimum) req.requires.allowances.thinWallWhenOdExceedsMinimum.minWall = 0.12;
    const saved = await services.rulebookAdmin.saveDraft(draft.id, ctx.adminId, { lockVersion: draft.lockVersion, document: doc as unknown as Record<string, unknown> });
    let sent: { queue: string; data: { versionId: string; previousVersionId: string | null; classIds: string[] } } | null = null;
    await services.rulebookAdmin.publish(draft.id, ctx.adminId, { lockVersion: saved.lockVersion, effectiveDate: '2028-01-01' }, {
      send: async (queue, data) => {
        sent = { queue, data };
        return randomUUID();
      },
    });
    if (!sent) throw new Error('publish queued no job');
    const job = sent as { data: { versionId: string; previousVersionId: string | null; classIds: string[] } };

    let done = 0;
    let failedCount = 0;
    const delay = monitorEventLoopDelay({ resolution: 5 });
    delay.enable();
    const start = performance.now();
    const outcome = await runRepublish(
      { ds, rulesets: services.rulesets, mail: services.mail, audit: services.audit, publicUrl: 'http://127.0.0.1:3000' },
      {
        id: randomUUID(),
        data: job.data,
        progress: {
          setTotal: async () => undefined,
          advance: async (c) => {
            done += c.done ?? 0;
            failedCount += c.failed ?? 0;
          },
        },
      },
    );
    const seconds = (performance.now() - start) / 1000;
    delay.disable();
    await services.checks.close();
    const result: RepublishBenchResult = {
      sheets: outcome.checked,
      seconds,
      sheetsPerSecond: outcome.checked / seconds,
      changed: outcome.changed,
      mailed: outcome.mailed,
      failed: failedCount,
      eventLoopDelayP99Ms: delay.percentile(99) / 1e6,
      eventLoopDelayMaxMs: delay.max / 1e6,
      seedSeconds,
      pass: seconds < REPUBLISH_TARGET_SECONDS && outcome.checked === n && done === n,
    };
    log(`re-checked ${result.sheets} sheets in ${seconds.toFixed(2)} s (${result.sheetsPerSecond.toFixed(0)} sheets/s); ${result.changed} changed, ${result.mailed} mails queued, ${result.failed} failed; event-loop delay p99 ${result.eventLoopDelayP99Ms.toFixed(1)} ms, max ${result.eventLoopDelayMaxMs.toFixed(1)} ms`);
    return result;
  } finally {
    await ds.destroy();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const r = await runRepublishBench({ log: true });
  console.log(`republish: ${r.sheets} sheets in ${r.seconds.toFixed(2)} s, ${r.sheetsPerSecond.toFixed(0)} sheets/s [target < ${REPUBLISH_TARGET_SECONDS} s] ${r.pass ? 'ok' : 'MISS'}`);
  process.exit(r.pass ? 0 : 1);
}

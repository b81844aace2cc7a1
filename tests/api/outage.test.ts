// PostgreSQL stops while checks and writes are in flight, and comes back (issue 12, §1). The real server
// runs as a child process against a cluster of this test's own (never the shared test cluster), under
// load from several signed-in clients. It shows: the process stays up; every request gets a 2xx or a
// clean 503 (database_unavailable, or the health probe's degraded body); service resumes within 2 s of
// the database's return without a restart; every acknowledged write is still there.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDataSource } from '../../backend/src/db/data-source';
import { migrate } from '../../backend/src/db/migrate';
import { seedDemo } from '../../backend/src/db/seed';
import { demoPassword } from '../../backend/src/db/seed-data';
import { ownCluster, signedInClient, startServer, type HttpClient, type OwnCluster, type ServerProcess } from './support/processes';

let cluster: OwnCluster;
let server: ServerProcess | undefined;
let versionId: string;

const hoop = (wallMm: number) => ({ odMm: 44.45, wallMm, material: 'mild_steel', process: 'dom', bends: [] });
/** The demo saloon (1.750 in hoops; 1 in = 25.4 mm, F-UNIT-1): a valid specification to check. */
const saloon = {
  vehicle: { classId: 'club-saloon', weightWithDriverKg: 1200, chassis: 'unibody', cockpit: 'closed' },
  members: [
    { id: 'mh', kind: 'main_hoop', ...hoop(3.048), lengthMm: 3350, continuousPiece: true },
    { id: 'fh', kind: 'front_hoop', ...hoop(3.048), lengthMm: 3900 },
    { id: 'rb-l', kind: 'rear_brace', ...hoop(3.048), lengthMm: 1150 },
    { id: 'rb-r', kind: 'rear_brace', ...hoop(3.048), lengthMm: 1150 },
  ],
  geometry: { rearBraceAttachBelowTopMm: 100, rearBraceAngleFromVerticalDeg: 38 },
};

beforeAll(async () => {
  cluster = await ownCluster('pg-outage', 'cagewright_outage');
  const ds = createDataSource({ databaseUrl: cluster.url, poolSize: 2 });
  await ds.initialize();
  try {
    await migrate(ds);
    await seedDemo(ds);
    const rows: { id: string }[] = await ds.query(
      `SELECT v.id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.slug = 'tarnwick-vale-mc-cage-regulations-2027' AND v.status = 'published'`,
    );
    versionId = rows[0]!.id;
  } finally {
    await ds.destroy();
  }
  server = await startServer({ DATABASE_URL: cluster.url });
}, 120_000);

afterAll(async () => {
  await server?.kill('SIGTERM');
  try {
    cluster?.stop();
  } catch {
    // already stopped
  }
}, 60_000);

interface Outcome {
  at: number;
  what: string;
  status: number | 'network-error';
  body: unknown;
}

/** True for a 2xx, or for the documented 503 bodies (the API's error shape, the health probe's). */
function clean(o: Outcome): boolean {
  if (typeof o.status === 'number' && o.status >= 200 && o.status < 300) return true;
  if (o.status !== 503) return false;
  const b = o.body as { error?: { code?: string }; status?: string } | null;
  return b?.error?.code === 'database_unavailable' || b?.status === 'degraded';
}

describe('a database outage while checks are in flight', () => {
  it('keeps the process up, answers 2xx or 503, resumes within 2 s and loses no acknowledged write', async () => {
    const srv = server!;
    const pid = srv.child.pid;
    const clients: HttpClient[] = [];
    for (let i = 0; i < 4; i++) clients.push(await signedInClient(srv.baseUrl, 'builder@tarnwick.example', demoPassword));

    const outcomes: Outcome[] = [];
    const acknowledgedCars: string[] = [];
    let running = true;
    const record = async (what: string, run: () => Promise<{ status: number; body: unknown }>) => {
      try {
        const r = await run();
        outcomes.push({ at: Date.now(), what, ...r });
        return r;
      } catch (err) {
        outcomes.push({ at: Date.now(), what, status: 'network-error', body: String(err) });
        return null;
      }
    };
    const check = { rulesetVersionId: versionId, classId: 'club-saloon', specification: saloon };
    const loops = clients.map(async (c, i) => {
      for (let n = 0; running; n++) {
        await record('check', () => c.request('POST', '/api/checks', check));
        const car = await record('create car', () => c.request('POST', '/api/cars', { name: `Outage car ${i}-${n}`, chassisType: 'unibody' }));
        const id = (car?.body as { car?: { id?: string } } | null)?.car?.id;
        if (car && car.status === 201 && id) acknowledgedCars.push(id);
        await record('health', () => c.request('GET', '/api/health'));
      }
    });

    // Let the load run until it has answers from before the outage: at least 1.5 s, and longer on a
    // loaded machine, where the first check (which starts the check workers) can take that long alone.
    const warm = Date.now();
    while (Date.now() - warm < 1500 || (outcomes.length < 6 && Date.now() - warm < 30_000)) await new Promise((r) => setTimeout(r, 50));
    const beforeStop = outcomes.length;
    cluster.stop();
    const stoppedAt = Date.now();
    await new Promise((r) => setTimeout(r, 2000));
    cluster.start();
    const backAt = Date.now();

    // Service is back when a signed-in request that reads the database (the session, the user) succeeds.
    const probe = clients[0]!;
    let resumedAt: number | null = null;
    while (Date.now() - backAt < 10_000) {
      const me = await record('me', () => probe.request('GET', '/api/auth/me'));
      if (me?.status === 200) {
        resumedAt = Date.now();
        break;
      }
      await new Promise((r) => setTimeout(r, 50));
    }
    // A little more load after the return, then stop.
    await new Promise((r) => setTimeout(r, 1000));
    running = false;
    await Promise.all(loops);

    const during = outcomes.filter((o) => o.at >= stoppedAt && o.at < backAt);
    const unclean = outcomes.filter((o) => !clean(o));
    expect(unclean, `unclean answers: ${JSON.stringify(unclean.slice(0, 5))}`).toEqual([]);
    // The load really ran on both sides of the outage and met it.
    expect(beforeStop).toBeGreaterThan(0);
    expect(during.some((o) => o.status === 503)).toBe(true);
    expect(outcomes.filter((o) => o.at > backAt && o.status === 200).length).toBeGreaterThan(0);

    expect(resumedAt, 'service never resumed').not.toBeNull();
    expect(resumedAt! - backAt).toBeLessThan(2000);

    // Still the same process, never restarted, and it answers.
    expect(srv.child.exitCode).toBeNull();
    expect(srv.child.pid).toBe(pid);
    expect((await fetch(`${srv.baseUrl}/api/health`)).status).toBe(200);
    expect(srv.output()).not.toMatch(/Unhandled 'error' event|uncaught/i);

    // Every car the API acknowledged (201 with its id) is in the database.
    expect(acknowledgedCars.length).toBeGreaterThan(0);
    const ds = createDataSource({ databaseUrl: cluster.url, poolSize: 1 });
    await ds.initialize();
    try {
      const rows: { id: string }[] = await ds.query(`SELECT id FROM cars WHERE id = ANY($1::uuid[])`, [acknowledgedCars]);
      expect(rows.length).toBe(acknowledgedCars.length);
    } finally {
      await ds.destroy();
    }
  }, 120_000);
});

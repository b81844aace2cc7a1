// Checks through the API: dry runs against the demo rulebooks (docs/api.md, "Rulesets and checks"),
// every refusal, saved check runs and who may read them, their immutability in the database, the
// compiled-ruleset cache and concurrent checks. The demo club's tables are invented, but their
// sizes follow published tables so the expectations can be checked against FACTS.md.
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { createServices, type Services } from '../../backend/src/services';
import { createCheckService, newCheckRunCode, type CheckServiceOptions } from '../../backend/src/services/checks.service';
import { isWellFormedVerificationCode } from '../../backend/src/domain/review/verification-code';
import { hashPassword } from '../../backend/src/services/passwords';
import { type Agent, agentFor, demo, errorBody, errorOf, hasErrorBody, makeTestApp, signIn, testPublicUrl, useTestDatabase } from './helpers';

const db = useTestDatabase();
const IN = 25.4; // mm per inch, exact (F-UNIT-1)
const LB = 0.45359237; // kg per pound, exact
const cageSlug = 'tarnwick-vale-mc-cage-regulations-2027';
const hillSlug = 'tarnwick-vale-mc-hillclimb-2027-metric';
const versionNotFound = { error: { code: 'not_found', message: 'Ruleset version not found.' } };
const runNotFound = { error: { code: 'not_found', message: 'Check run not found.' } };

type Json = Record<string, unknown>;
const tube = (id: string, kind: string, odIn: number, wallIn: number, extra: Json = {}) => ({
  id, kind, odMm: odIn * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom', ...extra,
});
const hoopBends = { bends: [{ clrMm: 6 * IN, minOdMm: 1.7 * IN, maxOdMm: 1.78 * IN }] };
const weldedFoot = { id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [6 * IN, 6 * IN], thicknessMm: 0.125 * IN };
const inspectionHole = { memberId: 'mh', diameterMm: (3 / 16) * IN, distanceFromWeldOrBendMm: 4 * IN };

/** A complete specification for each demo class, built to pass its rulebook. */
const validSpecs: Record<string, () => Json> = {
  // 1,400 lb without driver: up to 1,500 lb band, 1.500 × 0.095 in (the demo's sprint table follows
  // F-SCCA-T3's lightest row, ≤ 1,500 lb 1.375 × .095, with a larger OD of its own).
  'open-sprint': () => ({
    vehicle: { classId: 'open-sprint', weightWithoutDriverKg: 1400 * LB, cockpit: 'open', chassis: 'unibody' },
    members: [tube('mh', 'main_hoop', 1.5, 0.095, { continuousPiece: true, bends: [{ clrMm: 5 * IN, minOdMm: 1.46 * IN, maxOdMm: 1.52 * IN }] }), tube('rb1', 'rear_brace', 1.5, 0.095), tube('rb2', 'rear_brace', 1.5, 0.095)],
    geometry: { rearBraceAttachBelowTopMm: 3 * IN, rearBraceAngleFromVerticalDeg: 40, hoopAboveHelmetMm: 3 * IN, hoopBehindHelmetMm: 4 * IN, mainHoopInsideWidthMm: 18 * IN, nearestTubeToHelmetMm: 10 * IN },
    plates: [weldedFoot],
    inspectionHoles: [inspectionHole],
  }),
  // 2,400 lb with driver: the 2,201 – 3,000 lb band, 1.750 × 0.095 in (F-SCCA-T3: 2,201–3,000 lb 1.750 × .095).
  'club-saloon': () => ({
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 2400 * LB, cockpit: 'closed', chassis: 'unibody' },
    members: [
      tube('mh', 'main_hoop', 1.75, 0.095, { continuousPiece: true, ...hoopBends }), tube('fh', 'front_hoop', 1.75, 0.095, hoopBends),
      tube('rb1', 'rear_brace', 1.75, 0.095), tube('rb2', 'rear_brace', 1.75, 0.095),
      tube('db1', 'door_bar', 1.5, 0.095, { bends: [] }), tube('db2', 'door_bar', 1.5, 0.095, { bends: [] }),
      tube('dg', 'diagonal', 1.5, 0.095), tube('hb', 'harness_bar', 1.5, 0.095),
    ],
    geometry: { rearBraceAttachBelowTopMm: 3 * IN, rearBraceAngleFromVerticalDeg: 40, helmetBelowHoopLineMm: 2 * IN, harnessBarBelowShouldersMm: 1 * IN, nearestTubeToHelmetMm: 10 * IN },
    plates: [weldedFoot],
    inspectionHoles: [inspectionHole],
  }),
  // 3,000 lb, 4130 at 1.625 × 0.083 in, TIG welded (F-NHRA-1's 4130 size; F-NHRA-W1: 4130 by TIG only).
  'heavy-special': () => {
    const cm = { material: 'chromoly_4130' };
    // The Heavy Special table asks for each hoop's and brace's thinnest sonic reading (demo C4.2.3).
    const sonic = { wallReadings: [{ wallMm: 0.082 * IN, method: 'ultrasonic' }] };
    return {
      vehicle: { classId: 'heavy-special', weightWithDriverKg: 3000 * LB, cockpit: 'closed', chassis: 'tube_frame' },
      members: [
        tube('mh', 'main_hoop', 1.625, 0.083, { ...cm, ...sonic, continuousPiece: true, ...hoopBends }), tube('fh', 'front_hoop', 1.625, 0.083, { ...cm, ...sonic, ...hoopBends }),
        tube('rb1', 'rear_brace', 1.625, 0.083, { ...cm, ...sonic }), tube('rb2', 'rear_brace', 1.625, 0.083, { ...cm, ...sonic }),
        tube('db1', 'door_bar', 1.375, 0.083, { ...cm, bends: [] }), tube('db2', 'door_bar', 1.375, 0.083, { ...cm, bends: [] }),
        tube('dg', 'diagonal', 1.375, 0.083, cm), tube('hb', 'harness_bar', 1.375, 0.083, cm),
      ],
      geometry: { rearBraceAttachBelowTopMm: 3 * IN, rearBraceAngleFromVerticalDeg: 40, helmetBelowHoopLineMm: 2 * IN, harnessBarBelowShouldersMm: 1 * IN, nearestTubeToHelmetMm: 4 * IN },
      padding: { nearHelmet: true, standard: 'sfi_45_1' },
      welding: { process: 'tig' },
      plates: [weldedFoot],
      inspectionHoles: [inspectionHole],
    };
  },
  // Metric hillclimb schedule: 45 × 2.5 / 50 × 2.0 mm hoops (F-MSUK-2), 38 × 2.5 mm diagonal (F-MSUK-4),
  // 3 mm feet plates of ≥ 120 cm² with 3 bolts (F-FIA-M1).
  'hill-saloon': () => {
    // Hoops and backstays carry a sonic reading 0.1 mm under the wall (demo H2.1.1 allows 0.25 mm).
    const cds = (id: string, kind: string, odMm: number, wallMm: number) => ({ id, kind, odMm, wallMm, material: 'mild_steel', process: 'cds', wallReadings: [{ wallMm: wallMm - 0.1, method: 'ultrasonic' }] });
    const foot = (id: string, location: string, memberId: string, sidesMm: number[]) => ({ id, location, memberId, fixing: 'bolted', thicknessMm: 3, sidesMm, boltCount: 3, boltDiameterMm: 10, boltGrade: '8.8' });
    return {
      vehicle: { classId: 'hill-saloon', weightWithoutDriverKg: 1100, cockpit: 'closed', chassis: 'unibody' },
      members: [cds('mh', 'main_hoop', 45, 2.5), cds('fh', 'front_hoop', 45, 2.5), { ...cds('rb1', 'rear_brace', 45, 2.5), side: 'left' }, { ...cds('rb2', 'rear_brace', 50, 2.0), side: 'right' }, cds('dg', 'diagonal', 38, 2.5)],
      geometry: { rearBraceAngleFromVerticalDeg: 35 },
      plates: [foot('pl', 'main_hoop_foot', 'mh', [120, 120]), foot('pf', 'front_hoop_foot', 'fh', [120, 110])],
    };
  },
};
const rulebookOfClass: Record<string, string> = { 'open-sprint': cageSlug, 'club-saloon': cageSlug, 'heavy-special': cageSlug, 'hill-saloon': hillSlug };

let app: ReturnType<typeof makeTestApp>;
const versions: Record<string, string> = {};
let builder: Agent;
let builderToken: string;

async function userId(email: string): Promise<string> {
  return ((await db.ds.query('SELECT id FROM users WHERE email = $1', [email])) as { id: string }[])[0]!.id;
}

async function signedIn(email: string, password?: string): Promise<{ agent: Agent; token: string }> {
  const agent = agentFor(app);
  return { agent, token: await signIn(agent, email, password) };
}

function post(who: { agent: Agent; token: string }, body: unknown) {
  return who.agent.post('/api/checks').set('X-CSRF-Token', who.token).send(body as object);
}

function dryRunBody(classId: string, spec: Json = validSpecs[classId]!()) {
  return { rulesetVersionId: versions[rulebookOfClass[classId]!]!, classId, specification: spec };
}

beforeAll(async () => {
  app = makeTestApp(db.ds);
  for (const slug of [cageSlug, hillSlug]) {
    const rows: { id: string }[] = await db.ds.query(
      `SELECT v.id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.slug = $1 AND v.version_number = 1`,
      [slug],
    );
    versions[slug] = rows[0]!.id;
  }
  ({ agent: builder, token: builderToken } = await signedIn(demo.builder));
  // A second builder in the demo club, and an admin of another club.
  const hash = await hashPassword('second-builder-password');
  const club: { id: string }[] = await db.ds.query(`INSERT INTO clubs (slug, name) VALUES ('harrowgate-sprint', 'Harrowgate Sprint Club') RETURNING id`);
  const other: { id: string }[] = await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ('admin@harrowgate.example', 'Ola Brent', $1) RETURNING id`, [hash]);
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{builder,steward,admin}')`, [other[0]!.id, club[0]!.id]);
  const second: { id: string }[] = await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ('builder2@tarnwick.example', 'Sam Oakes', $1) RETURNING id`, [hash]);
  await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) SELECT $1, id, '{builder}' FROM clubs WHERE slug = 'tarnwick-vale'`, [second[0]!.id]);
});

describe('POST /api/checks: a dry run', () => {
  it.each(Object.keys(validSpecs))('checks a complete %s specification: it passes, every finding cites its section with measured and required values', async (classId) => {
    const res = await post({ agent: builder, token: builderToken }, dryRunBody(classId)).expect(200);
    const { report } = res.body;
    expect(Object.keys(res.body)).toEqual(['report']);
    expect(report).toMatchObject({ reportFormat: 1, classId, verdict: 'pass', rulebook: { publisher: 'Tarnwick Vale Motor Club', edition: '2027' } });
    expect(report.summary).toMatchObject({ fail: 0, needsInformation: 0 });
    expect(report.summary.pass).toBeGreaterThan(3);
    const applicable = report.findings.filter((f: { verdict: string }) => f.verdict !== 'not_applicable');
    expect(applicable.length).toBe(report.summary.pass);
    for (const f of applicable) {
      expect(f.verdict).toBe('pass');
      expect(f.citation).toEqual({ publisher: 'Tarnwick Vale Motor Club', rulebookTitle: report.rulebook.title, edition: '2027', section: expect.stringMatching(/^[CH]\d+(\.\d+)+$/) });
      expect(f.measured.length).toBeGreaterThan(0);
      expect(f.required.length).toBeGreaterThan(0);
    }
    // Safety: every report says it is a pre-check and who decides.
    expect(report.disclaimer).toMatch(/pre-check, not an approval/);
    expect(report.disclaimer).toMatch(/inspector decides/);
    expect(report.disclaimer).toMatch(/qualified people/);
    // Nothing is stored by a dry run.
    expect(await db.ds.query('SELECT count(*)::int AS n FROM check_runs')).toEqual([{ n: 0 }]);
  });

  it('fails a main hoop that is too thin for the weight, citing C4.2.2 with the measured and required sizes', async () => {
    // 1.750 × 0.083 in at 2,400 lb: the band needs 1.500 × 0.120 or 1.750 × 0.095 in (F-SCCA-T3, 2,201–3,000 lb row).
    const spec = validSpecs['club-saloon']!();
    (spec.members as Json[])[0]!.wallMm = 0.083 * IN;
    const { report } = (await post({ agent: builder, token: builderToken }, dryRunBody('club-saloon', spec)).expect(200)).body;
    expect(report.verdict).toBe('fail');
    expect(report.summary.fail).toBe(1);
    const failing = report.findings.filter((f: { verdict: string }) => f.verdict === 'fail');
    expect(failing).toHaveLength(1);
    const f = failing[0];
    expect(f).toMatchObject({
      requirementId: 'tv-saloon-tubes',
      severity: 'mandatory',
      citation: { publisher: 'Tarnwick Vale Motor Club', rulebookTitle: 'Tarnwick Vale MC Cage Regulations', edition: '2027', section: 'C4.2.2' },
      member: { id: 'mh', kind: 'main_hoop', index: 0 },
    });
    expect(f.measured).toContainEqual({ fact: 'member.wallMm', label: 'wall thickness', value: 0.083 * IN, dimension: 'length' });
    expect(f.required).toContainEqual({ fact: 'member.wallMm', label: 'wall thickness', operator: 'atLeast', value: expect.closeTo(0.095 * IN, 9), dimension: 'length' });
    expect(f.reason).toMatch(/2,201 – 3,000 lb/);
  });

  it('lists every invalid field of a malformed specification with its path', async () => {
    const spec = validSpecs['club-saloon']!();
    const members = spec.members as Json[];
    members[0]!.odMm = -44; // negative
    members[1]!.wallMm = 'thick'; // not a number
    members[2]!.kind = 'roll_hoop'; // unknown kind
    members[3]!.odMm = 4000; // an absurd OD (over the schema's 1000 mm)
    delete members[4]!.id;
    (spec.vehicle as Json).weightWithDriverKg = 0;
    const res = await post({ agent: builder, token: builderToken }, { ...dryRunBody('club-saloon', spec), rulesetVersionId: 'v1' }).expect(400);
    expect(res.body).toEqual(errorBody({
      error: {
        code: 'validation_failed',
        message: 'Some fields are invalid.',
        details: [
          { path: 'rulesetVersionId', message: 'Must be an id' },
          { path: 'specification.vehicle.weightWithDriverKg', message: 'Must be greater than zero' },
          // One message per problem: the range check speaks, the tube-size check stays quiet.
          { path: 'specification.members.0.odMm', message: 'Must be greater than zero' },
          { path: 'specification.members.1.wallMm', message: 'Invalid input: expected number, received string' },
          { path: 'specification.members.2.kind', message: expect.stringMatching(/^Invalid option: expected one of "main_hoop"\|"front_hoop"/) },
          { path: 'specification.members.3.odMm', message: 'Must be at most 1000' },
          { path: 'specification.members.4.id', message: 'Invalid input: expected string, received undefined' },
        ],
      },
    }));
  });

  it('refuses a wall of half the OD or more, and an OD that cannot be a cage tube, with messages', async () => {
    const spec = validSpecs['club-saloon']!();
    const members = spec.members as Json[];
    Object.assign(members[0]!, { odMm: 40, wallMm: 20 }); // wall = OD/2: a solid bar
    members[1]!.odMm = 900; // within the schema's bound, but no cage tube is 900 mm across
    Object.assign(members[2]!, { odMm: 30, wallReadings: [{ wallMm: 16, method: 'ultrasonic' }] }); // a reading over OD/2
    const res = await post({ agent: builder, token: builderToken }, dryRunBody('club-saloon', spec)).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details).toEqual([
      { path: 'specification.members.0.wallMm', message: 'A wall of 20 mm (0.787 in) is half the outside diameter or more; the tube would be solid.' },
      { path: 'specification.members.1.odMm', message: 'An outside diameter of 900 mm (35.433 in) is not a cage tube (over 150 mm); check the units.' },
      // The hoop's 6 in bend radius is now under half the 900 mm OD.
      { path: 'specification.members.1.bends.0.clrMm', message: 'A centreline radius under half the OD is not a bend.' },
      { path: 'specification.members.2.wallReadings.0.wallMm', message: 'A wall reading must be less than half the outside diameter.' },
    ]);
  });

  it('refuses a specification whose vehicle names another class than the one checked', async () => {
    const res = await post({ agent: builder, token: builderToken }, { ...dryRunBody('club-saloon'), classId: 'heavy-special' }).expect(400);
    expect(res.body).toEqual(errorBody({
      error: { code: 'validation_failed', message: 'Some fields are invalid.', details: [{ path: 'specification.vehicle.classId', message: 'Must be the class being checked ("heavy-special")' }] },
    }));
  });

  it('answers 404 for an unknown version and for an unknown class', async () => {
    await post({ agent: builder, token: builderToken }, { ...dryRunBody('club-saloon'), rulesetVersionId: randomUUID() }).expect(404).expect(hasErrorBody(versionNotFound));
    const spec = validSpecs['club-saloon']!();
    (spec.vehicle as Json).classId = 'rally-cross';
    const res = await post({ agent: builder, token: builderToken }, { ...dryRunBody('club-saloon', spec), classId: 'rally-cross' }).expect(404);
    expect(res.body).toEqual(errorBody({ error: { code: 'not_found', message: 'Unknown class "rally-cross". This ruleset has: open-sprint, club-saloon, heavy-special.' } }));
  });

  it('answers 404 to a member of another club, 401 when signed out, 403 without the CSRF token', async () => {
    await post(await signedIn('admin@harrowgate.example', 'second-builder-password'), dryRunBody('club-saloon')).expect(404).expect(hasErrorBody(versionNotFound));
    await agentFor(app).post('/api/checks').send(dryRunBody('club-saloon')).expect(403);
    const anon = agentFor(app);
    const token = (await anon.get('/api/auth/csrf')).body.token as string;
    await anon.post('/api/checks').set('X-CSRF-Token', token).send(dryRunBody('club-saloon')).expect(401).expect(hasErrorBody({ error: { code: 'unauthenticated', message: 'Please sign in.' } }));
  });

  it('lets stewards and admins check too', async () => {
    for (const email of [demo.steward, demo.admin]) {
      const { report } = (await post(await signedIn(email), dryRunBody('hill-saloon')).expect(200)).body;
      expect(report.verdict).toBe('pass');
    }
  });

  it('refuses values outside their fields\' plausible ranges, as a sheet write does (issue 9 §1), and stores nothing', async () => {
    const spec = validSpecs['club-saloon']!();
    // "2,800 lb" read as 2.8 lb: 1.27 kg (F-UNIT-1, 1 lb = 0.45359237 kg), and a wall typed as an OD.
    (spec.vehicle as Json).weightWithDriverKg = 2.8 * LB;
    (spec.members as Json[])[2]!.wallMm = 12;
    const res = await post({ agent: builder, token: builderToken }, dryRunBody('club-saloon', spec)).expect(400);
    expect(res.body.error).toEqual(errorOf({
      code: 'validation_failed',
      message: 'Some fields are invalid.',
      details: [
        { path: 'specification.vehicle.weightWithDriverKg', message: "A race car's weight is 200 to 5,000 kg (441 to 11,023 lb): check the units." },
        { path: 'specification.members.2.wallMm', message: "A cage tube's wall is 0.5 to 10 mm (0.02 to 0.394 in): check the units." },
      ],
    }));
    // The same car at 2,800 lb is in range and checked.
    const heavy = validSpecs['club-saloon']!();
    (heavy.vehicle as Json).weightWithDriverKg = 2800 * LB;
    expect((await post({ agent: builder, token: builderToken }, dryRunBody('club-saloon', heavy)).expect(200)).body.report.classId).toBe('club-saloon');
    expect(await db.ds.query('SELECT count(*)::int AS n FROM check_runs')).toEqual([{ n: 0 }]);
  });

  it('writes reason texts in the units asked for, numbers staying canonical', async () => {
    const spec = validSpecs['club-saloon']!();
    (spec.members as Json[])[0]!.wallMm = 0.083 * IN;
    const body = { ...dryRunBody('club-saloon', spec), unitSystem: 'metric' };
    const { report } = (await post({ agent: builder, token: builderToken }, body).expect(200)).body;
    const f = report.findings.find((x: { verdict: string }) => x.verdict === 'fail');
    // The rulebook's size keeps its own units; the measured and required walls are in mm.
    expect(f.reason).toMatch(/wall 2\.11 mm is under 2\.41 mm/);
    expect(f.measured).toContainEqual({ fact: 'member.wallMm', label: 'wall thickness', value: 0.083 * IN, dimension: 'length' });
  });
});

describe('ruleset version states', () => {
  it('checks against a draft only for the club’s admins', async () => {
    const rows: { id: string }[] = await db.ds.query(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document)
       SELECT rulebook_id, 2, 'draft', '2028 draft', '2028-01-01', document FROM ruleset_versions WHERE id = $1 RETURNING id`,
      [versions[hillSlug]],
    );
    const draft = { ...dryRunBody('hill-saloon'), rulesetVersionId: rows[0]!.id };
    expect((await post(await signedIn(demo.admin), draft).expect(200)).body.report.verdict).toBe('pass');
    await post({ agent: builder, token: builderToken }, draft).expect(404).expect(hasErrorBody(versionNotFound));
    await post(await signedIn(demo.steward), draft).expect(404).expect(hasErrorBody(versionNotFound));
    await db.ds.query('DELETE FROM ruleset_versions WHERE id = $1', [rows[0]!.id]);
  });

  it('refuses a retired version with 409, naming the current one when there is one', async () => {
    // A second rulebook version takes over: v1 is superseded, v2 published, then v1 retired.
    const v1 = versions[hillSlug]!;
    await db.ds.query(`UPDATE ruleset_versions SET status = 'superseded' WHERE id = $1`, [v1]);
    const rows: { id: string }[] = await db.ds.query(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document, published_at)
       SELECT rulebook_id, 3, 'published', '2028', '2028-03-01', document, now() FROM ruleset_versions WHERE id = $1 RETURNING id`,
      [v1],
    );
    // A superseded version can still be checked against (older cars may hold to it).
    expect((await post({ agent: builder, token: builderToken }, dryRunBody('hill-saloon')).expect(200)).body.report.verdict).toBe('pass');
    await db.ds.query(`UPDATE ruleset_versions SET status = 'retired' WHERE id = $1`, [v1]);
    await post({ agent: builder, token: builderToken }, dryRunBody('hill-saloon')).expect(409).expect(hasErrorBody({
      error: {
        code: 'conflict',
        message: 'This ruleset version is retired: checks against it are no longer possible. Check against the rulebook’s current version.',
        details: { currentVersionId: rows[0]!.id },
      },
    }));
    versions[hillSlug] = rows[0]!.id;
  });
});

describe('saved check runs', () => {
  let runId: string;
  let services: Services;
  beforeAll(() => {
    services = app.locals.services as Services;
  });

  it('are stored with the specification as checked, the report and a verification code', async () => {
    const spec = validSpecs['club-saloon']!();
    (spec.members as Json[])[0]!.wallMm = 0.083 * IN;
    const builderId = await userId(demo.builder);
    const run = await services.checks.saveRun({ rulesetVersionId: versions[cageSlug]!, classId: 'club-saloon', specification: spec, userId: builderId });
    runId = run.id;
    expect(run).toMatchObject({ rulesetVersionId: versions[cageSlug], classId: 'club-saloon', overallVerdict: 'fail', buildSheetRevisionId: null, createdBy: { id: builderId, displayName: 'Robin Ashcombe' } });
    // One code form for check runs and cage records (issue 9 §5): grouped, with a check character.
    expect(run.verificationCode).toMatch(/^([0-9A-HJKMNP-TV-Z]{4}-){6}[0-9A-HJKMNP-TV-Z]{4}$/);
    expect(isWellFormedVerificationCode(run.verificationCode)).toBe(true);
    expect(run.report.verdict).toBe('fail');
    expect(run.specification).toEqual(spec);
    const stored = await db.ds.query('SELECT overall_verdict, report, specification FROM check_runs WHERE id = $1', [runId]);
    expect(stored).toEqual([{ overall_verdict: 'fail', report: run.report, specification: spec }]);
  });

  it('refuse what a dry run refuses, and store nothing then', async () => {
    const builderId = await userId(demo.builder);
    const spec = validSpecs['club-saloon']!();
    (spec.members as Json[])[0]!.odMm = -1;
    await expect(services.checks.saveRun({ rulesetVersionId: versions[cageSlug]!, classId: 'club-saloon', specification: spec, userId: builderId })).rejects.toMatchObject({
      status: 400, details: expect.arrayContaining([{ path: 'specification.members.0.odMm', message: 'Must be greater than zero' }]),
    });
    const outsiderId = await userId('admin@harrowgate.example');
    await expect(services.checks.saveRun({ rulesetVersionId: versions[cageSlug]!, classId: 'club-saloon', specification: validSpecs['club-saloon']!(), userId: outsiderId })).rejects.toMatchObject({ status: 404 });
    expect(await db.ds.query('SELECT count(*)::int AS n FROM check_runs')).toEqual([{ n: 1 }]);
  });

  it('are readable by their creator and the club’s stewards and admins, by nobody else (404)', async () => {
    const res = await builder.get(`/api/check-runs/${runId}`).expect(200);
    expect(res.body.checkRun).toMatchObject({ id: runId, overallVerdict: 'fail', classId: 'club-saloon', createdBy: { displayName: 'Robin Ashcombe' } });
    expect(res.body.checkRun.createdAt).toMatch(/^\d{4}-\d{2}-\d{2}T/);
    for (const email of [demo.steward, demo.admin]) {
      expect((await (await signedIn(email)).agent.get(`/api/check-runs/${runId}`).expect(200)).body.checkRun.id).toBe(runId);
    }
    await (await signedIn('builder2@tarnwick.example', 'second-builder-password')).agent.get(`/api/check-runs/${runId}`).expect(404).expect(hasErrorBody(runNotFound));
    await (await signedIn('admin@harrowgate.example', 'second-builder-password')).agent.get(`/api/check-runs/${runId}`).expect(404).expect(hasErrorBody(runNotFound));
    await builder.get(`/api/check-runs/${randomUUID()}`).expect(404).expect(hasErrorBody(runNotFound));
    await agentFor(app).get(`/api/check-runs/${runId}`).expect(401);
  });

  it('can be neither changed nor deleted in the database', async () => {
    const refused = expect.objectContaining({ code: 'CW001', message: expect.stringMatching(/is a saved record and cannot be changed or deleted/) });
    const attempt = (sql: string) => db.ds.query(sql, [runId]).then(() => 'done', (e: unknown) => e);
    expect(await attempt(`UPDATE check_runs SET overall_verdict = 'pass' WHERE id = $1`)).toEqual(refused);
    expect(await attempt(`UPDATE check_runs SET report = '{}' WHERE id = $1`)).toEqual(refused);
    expect(await attempt(`DELETE FROM check_runs WHERE id = $1`)).toEqual(refused);
    expect(await db.ds.query('SELECT overall_verdict FROM check_runs WHERE id = $1', [runId])).toEqual([{ overall_verdict: 'fail' }]);
    // …and the version a saved run cites cannot be removed from under it.
    expect(await attempt(`DELETE FROM rulebooks WHERE id = (SELECT rulebook_id FROM ruleset_versions v JOIN check_runs c ON c.ruleset_version_id = v.id WHERE c.id = $1)`)).toEqual(
      expect.objectContaining({ code: 'CW001' }),
    );
  });

  it('get verification codes that differ', () => {
    const codes = new Set(Array.from({ length: 500 }, () => newCheckRunCode()));
    expect(codes.size).toBe(500);
  });
});

describe('compiled rulesets and concurrent checks', () => {
  /** An app whose checks run on the given engine, with fresh caches. */
  function appWith(options: CheckServiceOptions) {
    const base = createServices(db.ds, { publicUrl: testPublicUrl });
    const services: Services = { ...base, checks: createCheckService(db.ds, base.rulesets, options) };
    return { fresh: makeTestApp(db.ds, { services }), services };
  }

  it('compile a version once in process, however many checks use it', async () => {
    const { fresh, services } = appWith({ engine: 'in-process' });
    const agent = agentFor(fresh);
    const token = await signIn(agent, demo.builder);
    expect(services.rulesets.cacheStats()).toEqual({ compiles: 0, hits: 0, size: 0 });
    // Twenty at once on a cold cache still compile once: the first request's compilation is shared.
    await Promise.all(Array.from({ length: 20 }, () => post({ agent, token }, dryRunBody('club-saloon')).expect(200)));
    expect(services.rulesets.cacheStats()).toEqual({ compiles: 1, hits: 19, size: 1 });
    await post({ agent, token }, dryRunBody('open-sprint')).expect(200);
    await post({ agent, token }, dryRunBody('hill-saloon')).expect(200);
    expect(services.rulesets.cacheStats()).toEqual({ compiles: 2, hits: 20, size: 2 });
    expect(services.checks.engineStats()).toMatchObject({ mode: 'in-process', compiles: 2 });
  });

  it.each([1, 2])('compile a version once per worker thread (%i workers)', async (workers) => {
    const { fresh, services } = appWith({ workers });
    const agent = agentFor(fresh);
    const token = await signIn(agent, demo.builder);
    await Promise.all(Array.from({ length: 20 }, () => post({ agent, token }, dryRunBody('club-saloon')).expect(200)));
    expect(services.checks.engineStats()).toEqual({ mode: 'workers', compiles: workers, workers, inFlight: 0 });
    await Promise.all(Array.from({ length: 10 }, () => post({ agent, token }, dryRunBody('open-sprint')).expect(200)));
    expect(services.checks.engineStats().compiles).toBe(workers);
    // The main thread compiled nothing: the workers did.
    expect(services.rulesets.cacheStats().compiles).toBe(0);
    await services.checks.close();
  });

  it.each(['workers', 'in-process'] as const)('give every one of 20 parallel dry runs the same report as a check on its own (%s)', async (engine) => {
    const { fresh } = appWith({ engine, workers: 2 });
    const agent = agentFor(fresh);
    const who = { agent, token: await signIn(agent, demo.builder) };
    const thin = validSpecs['club-saloon']!();
    (thin.members as Json[])[0]!.wallMm = 0.083 * IN;
    const bodies = [dryRunBody('club-saloon'), dryRunBody('club-saloon', thin), dryRunBody('heavy-special'), dryRunBody('open-sprint')];
    const alone: { verdict: string }[] = [];
    for (const b of bodies) alone.push((await post(who, b).expect(200)).body.report);
    expect(alone.map((r) => r.verdict)).toEqual(['pass', 'fail', 'pass', 'pass']);
    const together = await Promise.all(Array.from({ length: 20 }, (_, i) => post(who, bodies[i % 4]).expect(200)));
    together.forEach((res, i) => expect(res.body.report).toEqual(alone[i % 4]));
  });
});

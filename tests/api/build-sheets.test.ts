// Build sheets: creating one on a car, reading it with tube data and a cut list, saving revisions
// with the stale-base 409 (also under two saves at once), history, the diff in words, and who may
// read or edit (owner edits; club stewards and admins read, 403 on edit; others 404).
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { hasErrorBody, makeTestApp, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, saloonSpec, type GarageFixture } from './garage-fixtures';
import { cageSpec } from '../fixtures/cage-model';

const db = useTestDatabase();
const notFound = { error: { code: 'not_found', message: 'Build sheet not found.' } };
const forbidden = { error: { code: 'forbidden', message: 'Only the builder who owns this car can change its build sheets.' } };

let app: ReturnType<typeof makeTestApp>;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;
let sheetId: string;
let carId: string;

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await garageFixture(db.ds);
  who = await everyone(app);
  ({ carId, sheetId } = await carWithSheet(who.builder, fx));
});

const save = (body: Record<string, unknown>, id = sheetId, as = who.builder) =>
  as.agent.put(`/api/build-sheets/${id}/specification`).set('X-CSRF-Token', as.token).send(body);

describe('a new build sheet', () => {
  it('starts at revision 1 with the tube data and cut list computed from its members', async () => {
    const res = await who.builder.agent.get(`/api/build-sheets/${sheetId}`).expect(200);
    const { buildSheet, revision, tubeData, access } = res.body;
    expect(access).toBe('owner');
    expect(buildSheet).toMatchObject({
      name: 'Full cage 2027', classId: 'club-saloon', currentRevision: 1, latestVerdict: null, archivedAt: null,
      car: { id: carId, name: 'Grey Saloon', raceNumber: '47', year: 1994 },
      owner: { displayName: 'Robin Ashcombe' }, club: { id: fx.clubId, name: 'Tarnwick Vale Motor Club' },
      rulebook: { id: fx.rulebookId, title: 'Tarnwick Vale MC Cage Regulations', edition: '2027', publisher: 'Tarnwick Vale Motor Club' },
    });
    expect(revision).toMatchObject({ number: 1, classId: 'club-saloon', memberCount: 8, createdBy: { displayName: 'Robin Ashcombe' } });
    const mh = tubeData.members.find((m: { memberId: string }) => m.memberId === 'mh');
    // F-ENG-1 (hollow circle): Z = π (D⁴ − d⁴) / (32 D); F-ENG-6: mass per metre = A × 7.85 g/cm³
    const D = 44.45, d = 44.45 - 2 * 2.413;
    expect(mh.sectionModulusMm3).toBeCloseTo((Math.PI * (D ** 4 - d ** 4)) / (32 * D), 6);
    expect(mh.massPerMetreKg).toBeCloseTo(((Math.PI / 4) * (D ** 2 - d ** 2) * 7.85) / 1000, 9);
    expect(tubeData.cutList.map((r: { odMm: number; memberIds: string[]; totalLengthMm: number; membersWithoutLength: string[] }) => [r.odMm, r.memberIds, r.totalLengthMm, r.membersWithoutLength])).toEqual([
      [44.45, ['mh', 'fh', 'rb-l', 'rb-r'], 3350 + 3900 + 1150 + 1150, []],
      [38.1, ['hb', 'db-l', 'db-r', 'dg'], 1180 + 1020 + 1020, ['dg']],
    ]);
    // What a person reads: the builder's names (no labels here, so the kind's words, numbered when repeated), never ids.
    expect(tubeData.cutList[1].memberNames).toEqual(['harness bar', 'door bar 1', 'door bar 2', 'diagonal']);
    expect(tubeData.namesWithoutLength).toEqual(['diagonal']);
    expect(tubeData.members.find((m: { memberId: string }) => m.memberId === 'rb-r').name).toBe('rear brace (backstay) 2');
    expect(tubeData.massComplete).toBe(false);
  });

  it('starts empty when no specification is given, with the car’s chassis', async () => {
    const res = await who.builder.agent.post(`/api/cars/${carId}/build-sheets`).set('X-CSRF-Token', who.builder.token)
      .send({ name: 'Roll bar only', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'open-sprint' }).expect(201);
    expect(res.body.revision.specification).toEqual({ vehicle: { classId: 'open-sprint', chassis: 'unibody' }, members: [] });
    expect(res.body.tubeData).toEqual({ members: [], cutList: [], estimatedTubeMassKg: 0, massComplete: true, membersWithoutLength: [], namesWithoutLength: [] });
  });

  it('refuses an unknown class, another club’s version, a club the builder is not in, and a bad specification', async () => {
    const post = (body: Record<string, unknown>) => who.builder.agent.post(`/api/cars/${carId}/build-sheets`).set('X-CSRF-Token', who.builder.token)
      .send({ name: 'X', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon', ...body });
    const cls = await post({ classId: 'formula-x' }).expect(400);
    expect(cls.body.error.details).toEqual([{ path: 'classId', message: expect.stringContaining('"club-saloon"') }]);
    await post({ rulesetVersionId: randomUUID() }).expect(404);
    await post({ clubId: randomUUID() }).expect(404).expect(hasErrorBody({ error: { code: 'not_found', message: 'Club not found.' } }));
    const bad = await post({ specification: { vehicle: { classId: 'club-saloon' }, members: [{ id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 30 }] } }).expect(400);
    expect(bad.body.error.details).toEqual([{ path: 'specification.members.0.wallMm', message: expect.any(String) }]);
  });

  it('needs the builder role in the club: a steward is refused with 403', async () => {
    const car = await who.steward.agent.post('/api/cars').set('X-CSRF-Token', who.steward.token).send({ name: 'Stewards car', chassisType: 'tube_frame' }).expect(201);
    await who.steward.agent.post(`/api/cars/${car.body.car.id}/build-sheets`).set('X-CSRF-Token', who.steward.token)
      .send({ name: 'X', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon' })
      .expect(403).expect(hasErrorBody({ error: { code: 'forbidden', message: 'You need the builder role in this club to keep build sheets for it.' } }));
  });
});

describe('saving revisions', () => {
  it('saves revision 2 from base 1 and refuses a second save from base 1 with 409 and the current number', async () => {
    const next = saloonSpec({ doorBarWallMm: 3 });
    const ok = await save({ baseRevision: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: next }).expect(200);
    expect(ok.body.buildSheet.currentRevision).toBe(2);
    expect(ok.body.revision.specification.members[5].wallMm).toBe(3);
    const stale = await save({ baseRevision: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() }).expect(409);
    expect(stale.body.error).toMatchObject({ code: 'conflict', details: { currentRevision: 2 } });
    // Nothing lost: revision 2 is what it was.
    const now = await who.builder.agent.get(`/api/build-sheets/${sheetId}`).expect(200);
    expect(now.body.revision.number).toBe(2);
    expect(now.body.revision.specification.members[5].wallMm).toBe(3);
  });

  it('lets exactly one of two simultaneous saves from the same base win', async () => {
    const body = (wall: number) => ({ baseRevision: 2, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec({ doorBarWallMm: wall }) });
    const results = await Promise.all([save(body(2.6)), save(body(2.8))]);
    expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
    const loser = results.find((r) => r.status === 409)!;
    expect(loser.body.error.details).toEqual({ currentRevision: 3 });
    const revs = await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions`).expect(200);
    expect(revs.body.revisions.map((r: { number: number }) => r.number)).toEqual([3, 2, 1]);
  });

  it('lists every invalid field of a bad specification with its path, and saves nothing', async () => {
    const spec = saloonSpec();
    (spec.members[0] as Record<string, unknown>).odMm = -1;
    (spec.members[1] as Record<string, unknown>).kind = 'space_frame';
    const res = await save({ baseRevision: 3, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: spec }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['specification.members.0.odMm', 'specification.members.1.kind']));
    const bad = await save({ baseRevision: 'three', classId: '' }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['baseRevision', 'classId', 'rulesetVersionId', 'specification']);
    expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}`)).body.buildSheet.currentRevision).toBe(3);
  });
});

describe('a cage model on the sheet (issue 10, "Bad input")', () => {
  const modelled = () => {
    const c = cageSpec();
    return { vehicle: { ...c.vehicle, classId: 'club-saloon', weightWithDriverKg: 1100 }, model: c.model, members: c.members.map((m) => ({ ...m, material: 'mild_steel' })) };
  };
  it('keeps the model and the paths it saved, and refuses each bad model input at its path without losing them', async () => {
    const { sheetId: own } = await carWithSheet(who.builder, fx);
    const ok = await save({ baseRevision: 1, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: modelled() }, own).expect(200);
    expect(ok.body.revision.specification.model).toEqual(modelled().model);
    expect(ok.body.revision.specification.members.map((m: { path: unknown }) => m.path)).toEqual(modelled().members.map((m) => m.path));

    const bad = modelled();
    bad.members[1]!.path = [{ nodeId: 'jl' }, { nodeId: 'nowhere' }]; // a node that does not exist
    bad.members[2]!.path = [{ nodeId: 'jr' }]; // fewer than two nodes
    bad.model.nodes.push({ id: 'hl-again', role: 'junction', xMm: 0, yMm: 600, zMm: 800 });
    bad.members[3]!.path = [{ nodeId: 'hl' }, { nodeId: 'hl-again' }]; // a zero-length segment
    bad.members[0]!.path[3] = { nodeId: 'tl', clrMm: 4000 }; // tangents overlap
    bad.model.nodes[8]!.xMm = -9000; // more than 5 m from the origin
    bad.model.nodes.push({ id: 'fl', role: 'foot', xMm: 10, yMm: 10, zMm: 0 }); // an id used twice
    const res = await save({ baseRevision: 2, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: bad }, own).expect(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining([
      'specification.members.1.path.1.nodeId', 'specification.members.2.path', 'specification.members.3.path.1.nodeId',
      'specification.members.0.path.3.clrMm', 'specification.model.nodes.8.xMm', `specification.model.nodes.${bad.model.nodes.length - 1}.id`,
    ]));
    const now = await who.builder.agent.get(`/api/build-sheets/${own}`).expect(200);
    expect(now.body.revision.number).toBe(2);
    expect(now.body.revision.specification.model).toEqual(modelled().model);
    // A member with a path names the model's developed length as its length.
    expect(now.body.tubeData.members.find((m: { memberId: string }) => m.memberId === 'bsl').lengthMm).toBeGreaterThan(0);
  });
});

describe('plausible ranges on write (issue 9 §1)', () => {
  it('refuses a weight 1,000× off and a wall typed as an OD at their paths, in both unit systems, and saves nothing', async () => {
    const before = (await who.builder.agent.get(`/api/build-sheets/${sheetId}`)).body.buildSheet.currentRevision;
    const spec = saloonSpec();
    // "2,800 lb" read as 2.8 lb: 1.27 kg (F-UNIT-1, 1 lb = 0.45359237 kg).
    (spec.vehicle as Record<string, unknown>).weightWithDriverKg = 2.8 * 0.45359237;
    (spec.members[2] as Record<string, unknown>).wallMm = 12;
    const res = await save({ baseRevision: before, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: spec }).expect(400);
    expect(res.body.error.details).toEqual([
      { path: 'specification.vehicle.weightWithDriverKg', message: "A race car's weight is 200 to 5,000 kg (441 to 11,023 lb): check the units." },
      { path: 'specification.members.2.wallMm', message: "A cage tube's wall is 0.5 to 10 mm (0.02 to 0.394 in): check the units." },
    ]);
    expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}`)).body.buildSheet.currentRevision).toBe(before);
  });

  it('refuses the same on a new sheet', async () => {
    const spec = saloonSpec();
    (spec.members[0] as Record<string, unknown>).lengthMm = 8_000; // 800 mm typed with one zero too many
    const res = await who.builder.agent.post(`/api/cars/${carId}/build-sheets`).set('X-CSRF-Token', who.builder.token)
      .send({ name: 'Slip', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: spec }).expect(400);
    expect(res.body.error.details).toEqual([
      { path: 'specification.members.0.lengthMm', message: "A cage member's length is 50 to 6,000 mm (1.969 to 236.22 in): check the units." },
    ]);
  });

  it('refuses a cage approved in the future and a side on a member that spans the car, at their paths (issue 9 "Bad input")', async () => {
    const spec = saloonSpec() as Record<string, unknown> & { members: Record<string, unknown>[] };
    spec.cage = { approvedOn: '2999-01-01' };
    spec.members[0]!.side = 'left'; // the main hoop
    spec.members[6]!.side = 'right'; // a door bar may have one
    const res = await who.builder.agent.post(`/api/cars/${carId}/build-sheets`).set('X-CSRF-Token', who.builder.token)
      .send({ name: 'Future', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: spec }).expect(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['specification.cage.approvedOn', 'specification.members.0.side']);
  });

  it('still checks a revision stored before its value was judged implausible: ranges apply to writes only', async () => {
    const { sheetId: oldSheet } = await carWithSheet(who.builder, fx);
    const latest = await db.ds.query('SELECT id, specification FROM build_sheet_revisions WHERE build_sheet_id = $1 AND number = 1', [oldSheet]);
    const stored = { ...latest[0].specification, vehicle: { ...latest[0].specification.vehicle, weightWithDriverKg: 150 } };
    await db.ds.query('UPDATE build_sheet_revisions SET specification = $2 WHERE id = $1', [latest[0].id, JSON.stringify(stored)]);
    const run = await who.builder.agent.post(`/api/build-sheets/${oldSheet}/check-runs`).set('X-CSRF-Token', who.builder.token).expect(201);
    expect(run.body.checkRun.specification.vehicle.weightWithDriverKg).toBe(150);
    expect(['pass', 'fail', 'needs_information']).toContain(run.body.checkRun.overallVerdict);
  });
});

describe('history and diff', () => {
  it('shows one revision and the changes between two in words, in the reader’s units', async () => {
    const rev1 = await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions/1`).expect(200);
    expect(rev1.body.revision.specification.members[5].wallMm).toBe(2.413);
    await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions/99`).expect(404);
    const diff = await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions/1/diff/2`).expect(200);
    expect(diff.body.from).toBe(1);
    expect(diff.body.changes).toEqual([
      expect.objectContaining({ kind: 'changed', section: 'members', subjectId: 'hb', field: 'wallMm', before: 2.413, after: 3, dimension: 'length', text: 'harness bar "hb": wall 0.095 in → 0.118 in' }),
      expect.objectContaining({ subjectId: 'db-l', field: 'wallMm' }),
      expect.objectContaining({ subjectId: 'db-r', field: 'wallMm' }),
      expect.objectContaining({ subjectId: 'dg', field: 'wallMm' }),
    ]);
    const bad = await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions/one/diff/2`).expect(400);
    expect(bad.body.error.details[0].path).toBe('params.from');
  });
});

describe('who may see and change a sheet', () => {
  it.each(['steward', 'admin'] as const)('a club %s reads the sheet, its history and diff, but gets 403 on every edit', async (role) => {
    const { agent, token } = who[role];
    const res = await agent.get(`/api/build-sheets/${sheetId}`).expect(200);
    expect(res.body.access).toBe('reviewer');
    await agent.get(`/api/build-sheets/${sheetId}/revisions`).expect(200);
    await agent.get(`/api/build-sheets/${sheetId}/revisions/1/diff/3`).expect(200);
    await agent.put(`/api/build-sheets/${sheetId}/specification`).set('X-CSRF-Token', token)
      .send({ baseRevision: 3, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() }).expect(403).expect(hasErrorBody(forbidden));
    await agent.patch(`/api/build-sheets/${sheetId}`).set('X-CSRF-Token', token).send({ name: 'Mine now' }).expect(403).expect(hasErrorBody(forbidden));
    await agent.post(`/api/build-sheets/${sheetId}/archive`).set('X-CSRF-Token', token).expect(403).expect(hasErrorBody(forbidden));
    // The car itself is only ever the owner's.
    await agent.get(`/api/cars/${carId}`).expect(404);
  });

  it.each(['otherBuilder', 'outsider'] as const)('the %s gets 404 for reading and editing alike', async (role) => {
    const { agent, token } = who[role];
    await agent.get(`/api/build-sheets/${sheetId}`).expect(404).expect(hasErrorBody(notFound));
    await agent.get(`/api/build-sheets/${sheetId}/revisions`).expect(404).expect(hasErrorBody(notFound));
    await agent.get(`/api/build-sheets/${sheetId}/revisions/1/diff/2`).expect(404).expect(hasErrorBody(notFound));
    await agent.put(`/api/build-sheets/${sheetId}/specification`).set('X-CSRF-Token', token)
      .send({ baseRevision: 3, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() }).expect(404).expect(hasErrorBody(notFound));
    await agent.patch(`/api/build-sheets/${sheetId}`).set('X-CSRF-Token', token).send({ name: 'Mine now' }).expect(404).expect(hasErrorBody(notFound));
  });

  it('answers 401 when signed out, 404 for an unknown sheet, 400 for a malformed id', async () => {
    await request(app).get(`/api/build-sheets/${sheetId}`).expect(401);
    await who.builder.agent.get(`/api/build-sheets/${randomUUID()}`).expect(404).expect(hasErrorBody(notFound));
    const bad = await who.builder.agent.get('/api/build-sheets/not-an-id').expect(400);
    expect(bad.body.error.details[0].path).toBe('params.sheetId');
  });
});

describe('renaming and archiving', () => {
  it('renames, archives (refusing saves while archived) and unarchives', async () => {
    const t = who.builder.token;
    const renamed = await who.builder.agent.patch(`/api/build-sheets/${sheetId}`).set('X-CSRF-Token', t).send({ name: 'Full cage, 2027 season' }).expect(200);
    expect(renamed.body.buildSheet.name).toBe('Full cage, 2027 season');
    const archived = await who.builder.agent.post(`/api/build-sheets/${sheetId}/archive`).set('X-CSRF-Token', t).expect(200);
    expect(archived.body.buildSheet.archivedAt).not.toBeNull();
    const refused = await save({ baseRevision: 3, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() }).expect(409);
    expect(refused.body.error.message).toMatch(/archived/);
    const list = await who.builder.agent.get('/api/cars').expect(200);
    expect(list.body.cars[0].buildSheets.map((s: { id: string }) => s.id)).not.toContain(sheetId);
    const all = await who.builder.agent.get('/api/cars?show=all').expect(200);
    expect(all.body.cars[0].buildSheets.map((s: { id: string }) => s.id)).toContain(sheetId);
    await who.builder.agent.post(`/api/build-sheets/${sheetId}/unarchive`).set('X-CSRF-Token', t).expect(200);
    await save({ baseRevision: 3, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() }).expect(200);
  });
});

// Tube stock lists and the tube chooser over the API: the club's list started from the common sizes,
// kept by admins (audited), read by every member; builders' own sizes; refused roles and bad input
// in the error shape; the chooser for a sheet under its rulebook, read by whoever reads the sheet.
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { COMMON_STOCK } from '../../backend/src/domain/common-stock';
import { makeTestApp, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, saloonSpec, type GarageFixture, type SignedIn } from './garage-fixtures';

const db = useTestDatabase();
const IN = 25.4;
let app: ReturnType<typeof makeTestApp>;
let who: Awaited<ReturnType<typeof everyone>>;
let fx: GarageFixture;

const base = () => `/api/clubs/${fx.clubId}/tube-stock`;
const send = (as: SignedIn, method: 'post' | 'patch' | 'delete', url: string) => as.agent[method](url).set('X-CSRF-Token', as.token);
const tube = (over: Record<string, unknown> = {}) => ({ odMm: 41.275, wallMm: 2.108, material: 'mild_steel', process: 'dom', label: '1.625 × 0.083 in DOM (club test)', ...over });

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await garageFixture(db.ds);
  who = await everyone(app);
});

describe('the club stock list', () => {
  it('starts from the common sizes once, even when first read by several people at the same moment', async () => {
    const [a, b, c] = await Promise.all([who.builder, who.steward, who.admin].map((p) => p.agent.get(base()).expect(200)));
    expect(a.body.tubes).toHaveLength(COMMON_STOCK.length);
    expect(b.body.tubes).toHaveLength(COMMON_STOCK.length);
    expect(c.body.tubes).toHaveLength(COMMON_STOCK.length);
    expect([a.body.canEdit, b.body.canEdit, c.body.canEdit]).toEqual([false, false, true]);
    const dom = a.body.tubes.find((t: { label: string }) => t.label === '1.5 × 0.095 in DOM 1020');
    // F-ENG-4: 1.500 × 0.095 in is 1.426 lb/ft; 1 lb/ft = 1.4882 kg/m (F-UNIT-1).
    expect(dom).toMatchObject({ list: 'club', common: true, material: 'mild_steel', process: 'dom', yieldMpa: 414, yieldSource: 'ASTM A513 minimum (F-MAT-1)' });
    expect(dom.massPerMetreKg / 1.48816).toBeCloseTo(1.426, 2);
  });

  it('is refused to people outside the club (404) and to nobody signed in (401)', async () => {
    await who.outsider.agent.get(base()).expect(404);
    const res = await request(app).get(base()).expect(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('admins add, change and remove sizes; each change is in the activity log', async () => {
    const added = await send(who.admin, 'post', base()).send(tube()).expect(201);
    expect(added.body.tube).toMatchObject({ list: 'club', common: false, label: '1.625 × 0.083 in DOM (club test)', grade: null, yieldMpa: null });
    const id = added.body.tube.id as string;
    const changed = await send(who.admin, 'patch', `${base()}/${id}`).send({ yieldMpa: 414, grade: '1020 DOM', yieldSource: 'Mill certificate 4471' }).expect(200);
    expect(changed.body.tube).toMatchObject({ yieldMpa: 414, grade: '1020 DOM', yieldSource: 'Mill certificate 4471' });
    const cleared = await send(who.admin, 'patch', `${base()}/${id}`).send({ yieldSource: null }).expect(200);
    expect(cleared.body.tube.yieldSource).toBeNull();
    await send(who.admin, 'delete', `${base()}/${id}`).expect(204);
    await send(who.admin, 'delete', `${base()}/${id}`).expect(404);
    const log = await who.admin.agent.get(`/api/clubs/${fx.clubId}/audit?pageSize=50`).expect(200);
    const mine = log.body.entries.filter((e: { entityId: string }) => e.entityId === id).map((e: { action: string }) => e.action);
    expect(mine.sort()).toEqual(['tube_stock.added', 'tube_stock.changed', 'tube_stock.changed', 'tube_stock.removed']);
  });

  it('refuses builders and stewards (403) and keeps the list as it was', async () => {
    const before = (await who.admin.agent.get(base()).expect(200)).body.tubes.length;
    for (const p of [who.builder, who.steward]) {
      const res = await send(p, 'post', base()).send(tube()).expect(403);
      expect(res.body.error.code).toBe('forbidden');
    }
    const some = (await who.admin.agent.get(base())).body.tubes[0].id as string;
    await send(who.builder, 'patch', `${base()}/${some}`).send({ label: 'x' }).expect(403);
    await send(who.steward, 'delete', `${base()}/${some}`).expect(403);
    await send(who.outsider, 'post', base()).send(tube()).expect(404);
    expect((await who.admin.agent.get(base())).body.tubes.length).toBe(before);
  });

  it('refuses bad input at its field: a wall of half the OD or more, unknown values, strays, duplicates', async () => {
    const solid = await send(who.admin, 'post', base()).send(tube({ odMm: 40, wallMm: 20 })).expect(400);
    expect(solid.body.error).toMatchObject({ code: 'validation_failed', details: [{ path: 'wallMm', message: expect.stringMatching(/half the outside diameter or more/) }] });
    const bad = await send(who.admin, 'post', base()).send({ odMm: -1, wallMm: 'thick', material: 'titanium', process: 'dom', colour: 'red' }).expect(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['', 'material', 'odMm', 'wallMm'].sort());
    const huge = await send(who.admin, 'post', base()).send(tube({ odMm: 1016 })).expect(400);
    expect(huge.body.error.details[0].path).toBe('odMm');
    const dup = await send(who.admin, 'post', base()).send(tube({ odMm: 1.5 * IN, wallMm: 0.095 * IN, label: 'again' })).expect(409);
    expect(dup.body.error.message).toMatch(/already on the list as “1.5 × 0.095 in DOM 1020”/);
    // A change that leaves the old wall at half the new OD is refused at the field that was changed.
    const t = (await who.admin.agent.get(base())).body.tubes.find((x: { label: string }) => x.label === '1.25 × 0.120 in DOM 1020');
    const shrink = await send(who.admin, 'patch', `${base()}/${t.id}`).send({ odMm: 5 }).expect(400);
    expect(shrink.body.error.details).toEqual([{ path: 'odMm', message: expect.stringMatching(/half the outside diameter/) }]);
    await send(who.admin, 'patch', `${base()}/${t.id}`).send({}).expect(400);
    const still = (await who.admin.agent.get(base())).body.tubes.find((x: { id: string }) => x.id === t.id);
    expect(still.odMm).toBeCloseTo(1.25 * IN, 9);
  });

  it('adds back the common sizes that were removed, and only those', async () => {
    const list = (await who.admin.agent.get(base())).body.tubes;
    const gone = list.filter((t: { common: boolean }) => t.common).slice(0, 2);
    for (const t of gone) await send(who.admin, 'delete', `${base()}/${t.id}`).expect(204);
    const res = await send(who.admin, 'post', `${base()}/common`).expect(200);
    expect(res.body.added).toBe(2);
    expect(res.body.list.tubes).toHaveLength(list.length);
    expect((await send(who.admin, 'post', `${base()}/common`).expect(200)).body.added).toBe(0);
    await send(who.builder, 'post', `${base()}/common`).expect(403);
  });
});

describe("a builder's own sizes", () => {
  it('belong to the builder alone; someone with no builder role cannot keep any', async () => {
    const mine = await send(who.builder, 'post', '/api/tube-stock/mine').send(tube({ label: 'Offcut rack 1.625 × 0.083' })).expect(201);
    expect(mine.body.tube).toMatchObject({ list: 'mine', label: 'Offcut rack 1.625 × 0.083' });
    const id = mine.body.tube.id as string;
    expect((await who.builder.agent.get('/api/tube-stock/mine').expect(200)).body).toMatchObject({ canEdit: true, tubes: [{ id }] });
    expect((await who.otherBuilder.agent.get('/api/tube-stock/mine').expect(200)).body.tubes).toEqual([]);
    await send(who.otherBuilder, 'patch', `/api/tube-stock/mine/${id}`).send({ label: 'taken' }).expect(404);
    await send(who.otherBuilder, 'delete', `/api/tube-stock/mine/${id}`).expect(404);
    const refused = await send(who.outsider, 'post', '/api/tube-stock/mine').send(tube()).expect(403);
    expect(refused.body.error.message).toMatch(/builder role/);
    expect((await who.outsider.agent.get('/api/tube-stock/mine').expect(200)).body.canEdit).toBe(false);
    const solid = await send(who.builder, 'post', '/api/tube-stock/mine').send(tube({ wallMm: 30 })).expect(400);
    expect(solid.body.error.details[0].path).toBe('wallMm');
    await send(who.builder, 'patch', `/api/tube-stock/mine/${id}`).send({ label: 'Rack A' }).expect(200);
    await send(who.builder, 'delete', `/api/tube-stock/mine/${id}`).expect(204);
    await send(who.builder, 'patch', '/api/tube-stock/mine/not-an-id').send({ label: 'x' }).expect(400);
  });
});

describe('the tube chooser for a sheet', () => {
  const heavyHoopSpec = () => {
    const spec = saloonSpec();
    // Heavier than the band needs: 1.750 × 0.120 in main hoop, bent at 6 in CLR (ratio 3.43 ≥ 3).
    const [mh, ...rest] = spec.members;
    return { ...spec, members: [{ ...mh, odMm: 1.75 * IN, wallMm: 0.12 * IN, bends: [{ clrMm: 6 * IN, minOdMm: 43.9, maxOdMm: 44.6 }] }, ...rest] };
  };

  it('gives each member the lightest legal size from the club list, with the saving, under the sheet’s rulebook', async () => {
    const { sheetId } = await carWithSheet(who.builder, fx, heavyHoopSpec());
    const res = await who.builder.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(200);
    const body = res.body;
    expect(body).toMatchObject({ sheetId, revision: 1, classId: 'club-saloon', anyMaterial: false, stock: { club: COMMON_STOCK.length, mine: 0 } });
    expect(body.caution).toMatch(/qualified people working under local rules/);
    expect(body.caution).toMatch(/an aid, not a substitute for measuring the car/);
    const mh = body.members.find((m: { memberId: string }) => m.memberId === 'mh');
    // Club saloon at 1,200 kg (2,646 lb): 1.500 × 0.120 or 1.750 × 0.095 in (the demo table); the lightest is
    // 1.750 × 0.095 DOM: 1.679 lb/ft against 2.089 lb/ft for the 1.750 × 0.120 on the sheet (F-ENG-4).
    expect(mh.current).toMatchObject({ list: 'sheet', status: 'legal' });
    expect(mh.lightest).toMatchObject({ list: 'club', label: '1.75 × 0.095 in DOM 1020', status: 'legal', matched: ['1.750 × 0.095 in'] });
    expect(mh.savingPerMetreKg / 1.48816).toBeCloseTo(2.089 - 1.679, 2);
    expect(mh.savingKg).toBeCloseTo((mh.savingPerMetreKg * 3350) / 1000, 9);
    expect(mh.alternatives.length).toBeGreaterThan(0);
    expect(mh.alternatives.every((c: { massPerMetreKg: number }) => c.massPerMetreKg >= mh.lightest.massPerMetreKg)).toBe(true);
    // The front hoop lists no bends, so the bend rule cannot be decided: nothing is called legal.
    const fh = body.members.find((m: { memberId: string }) => m.memberId === 'fh');
    expect(fh.lightest).toBeNull();
    expect(fh.undecided[0].missing.map((m: { fact: string }) => m.fact)).toContain('member.bendCount');
  });

  it('includes the builder’s own sizes, for the builder and for a steward reading the sheet', async () => {
    const { sheetId } = await carWithSheet(who.builder, fx, heavyHoopSpec());
    const club = (await who.admin.agent.get(base())).body.tubes;
    const dom = club.find((t: { label: string }) => t.label === '1.75 × 0.095 in DOM 1020');
    await send(who.admin, 'delete', `${base()}/${dom.id}`).expect(204);
    const own = await send(who.builder, 'post', '/api/tube-stock/mine').send({ odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'seamless', label: 'Seamless from the rack' }).expect(201);
    for (const reader of [who.builder, who.steward]) {
      const res = await reader.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(200);
      const mh = res.body.members.find((m: { memberId: string }) => m.memberId === 'mh');
      expect(mh.lightest).toMatchObject({ list: 'mine', stockId: own.body.tube.id, label: 'Seamless from the rack' });
      expect(res.body.stock.mine).toBe(1);
    }
    await send(who.admin, 'post', `${base()}/common`).expect(200);
    await send(who.builder, 'delete', `/api/tube-stock/mine/${own.body.tube.id}`).expect(204);
  });

  it('is refused to anyone who may not read the sheet, and checks its query', async () => {
    const { sheetId } = await carWithSheet(who.builder, fx, heavyHoopSpec());
    await who.otherBuilder.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(404);
    await who.outsider.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(404);
    const bad = await who.builder.agent.get(`/api/build-sheets/${sheetId}/tube-choice?anyMaterial=maybe`).expect(400);
    expect(bad.body.error.details[0].path).toBe('query.anyMaterial');
    const any = await who.builder.agent.get(`/api/build-sheets/${sheetId}/tube-choice?anyMaterial=true`).expect(200);
    // 4130 is forbidden in the club saloon class (tv-no-chromoly), so widening the materials changes nothing legal.
    const mh = any.body.members.find((m: { memberId: string }) => m.memberId === 'mh');
    expect(mh.lightest.material).toBe('mild_steel');
    await who.builder.agent.get('/api/build-sheets/00000000-0000-4000-8000-000000000000/tube-choice').expect(404);
  });

  describe('putting a chosen size on the sheet', () => {
    const apply = (as: SignedIn, sheetId: string, body: Record<string, unknown>) => send(as, 'post', `/api/build-sheets/${sheetId}/tube-choice/apply`).send(body);
    const sheetOf = async (sheetId: string) => (await who.builder.agent.get(`/api/build-sheets/${sheetId}`).expect(200)).body;

    it('saves the lightest legal size as the next revision, and undo restores the tubes as a newer one', async () => {
      const { sheetId } = await carWithSheet(who.builder, fx, heavyHoopSpec());
      const choice = (await who.builder.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(200)).body;
      expect(choice.canApply).toBe(true);
      const mh = choice.members.find((m: { memberId: string }) => m.memberId === 'mh');
      const res = await apply(who.builder, sheetId, { baseRevision: 1, memberId: 'mh', stockId: mh.lightest.stockId }).expect(200);
      expect(res.body).toMatchObject({ revision: 2, previousRevision: 1, changes: [{ memberId: 'mh', memberName: 'main hoop', to: { label: '1.75 × 0.095 in DOM 1020', material: 'mild_steel', process: 'dom' } }] });
      expect(res.body.changes[0].from.wallMm).toBeCloseTo(0.12 * IN, 9);
      const after = await sheetOf(sheetId);
      expect(after.revision.number).toBe(2);
      const hoop = after.revision.specification.members.find((m: { id: string }) => m.id === 'mh');
      expect(hoop.wallMm).toBeCloseTo(0.095 * IN, 9);
      // Only the tube changed: its bends and length are kept.
      expect(hoop.bends).toEqual([{ clrMm: 6 * IN, minOdMm: 43.9, maxOdMm: 44.6 }]);
      // The chooser now reads revision 2, where the hoop is already the lightest.
      const again = (await who.builder.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(200)).body;
      expect(again.revision).toBe(2);
      expect(again.members.find((m: { memberId: string }) => m.memberId === 'mh').savingPerMetreKg).toBeCloseTo(0, 9);
      // Undo: revision 1 restored as revision 3.
      const undo = await send(who.builder, 'post', `/api/build-sheets/${sheetId}/revisions/1/restore`).send({ baseRevision: 2 }).expect(200);
      expect(undo.body.revision.number).toBe(3);
      expect(undo.body.revision.specification.members.find((m: { id: string }) => m.id === 'mh').wallMm).toBeCloseTo(0.12 * IN, 9);
      expect((await who.builder.agent.get(`/api/build-sheets/${sheetId}/revisions`).expect(200)).body.revisions.map((r: { number: number }) => r.number)).toEqual([3, 2, 1]);
    });

    it('refuses a stale revision, a size that is not legal, an unknown member and bad input, and changes nothing', async () => {
      const { sheetId } = await carWithSheet(who.builder, fx, heavyHoopSpec());
      const club = (await who.builder.agent.get(base())).body.tubes as { id: string; label: string; odMm: number; wallMm: number; material: string }[];
      const legal = (await who.builder.agent.get(`/api/build-sheets/${sheetId}/tube-choice`)).body.members.find((m: { memberId: string }) => m.memberId === 'mh').lightest.stockId;
      const stale = await apply(who.builder, sheetId, { baseRevision: 7, memberId: 'mh', stockId: legal }).expect(409);
      expect(stale.body.error).toMatchObject({ code: 'conflict', details: { currentRevision: 1 } });
      // A 4130 size: not in the hoop's material, and 4130 is not allowed in this class either.
      const alloy = club.find((t) => t.material === 'chromoly_4130')!;
      const illegal = await apply(who.builder, sheetId, { baseRevision: 1, memberId: 'mh', stockId: alloy.id }).expect(400);
      expect(illegal.body.error.details).toEqual([{ path: 'stockId', message: expect.stringMatching(/^That size is not legal for main hoop under .* in its material\.$/) }]);
      const nobody = await apply(who.builder, sheetId, { baseRevision: 1, memberId: 'zz', stockId: legal }).expect(400);
      expect(nobody.body.error.details[0].path).toBe('memberId');
      const bad = await apply(who.builder, sheetId, { baseRevision: 0, memberId: 'mh', stockId: 'nope', extra: 1 }).expect(400);
      expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['', 'baseRevision', 'stockId']);
      expect((await sheetOf(sheetId)).revision.number).toBe(1);
    });

    it('is the builder’s alone: a steward may read the choice but not apply it; others do not find the sheet', async () => {
      const { sheetId } = await carWithSheet(who.builder, fx, heavyHoopSpec());
      const read = (await who.steward.agent.get(`/api/build-sheets/${sheetId}/tube-choice`).expect(200)).body;
      expect(read.canApply).toBe(false);
      const stockId = read.members.find((m: { memberId: string }) => m.memberId === 'mh').lightest.stockId;
      await apply(who.steward, sheetId, { baseRevision: 1, memberId: 'mh', stockId }).expect(403);
      await apply(who.otherBuilder, sheetId, { baseRevision: 1, memberId: 'mh', stockId }).expect(404);
      await send(who.steward, 'post', `/api/build-sheets/${sheetId}/revisions/1/restore`).send({ baseRevision: 1 }).expect(403);
      await send(who.builder, 'post', `/api/build-sheets/${sheetId}/revisions/9/restore`).send({ baseRevision: 1 }).expect(404);
      await send(who.builder, 'post', `/api/build-sheets/${sheetId}/revisions/1/restore`).send({ baseRevision: 5 }).expect(409);
      expect((await sheetOf(sheetId)).revision.number).toBe(1);
    });
  });
});

// POST /api/geometry/derive (docs/api.md, "Cage geometry"): the cage model's derived values without
// a ruleset, for signed-in users only, with every invalid field refused at its path.
import { beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { type Agent, agentFor, demo, errorBody, hasErrorBody, makeTestApp, signIn, useTestDatabase } from './helpers';
import { cageSpec } from '../fixtures/cage-model';

const db = useTestDatabase();
let app: Express;
let builder: Agent;
let token: string;

beforeAll(async () => {
  app = makeTestApp(db.ds);
  builder = agentFor(app);
  token = await signIn(builder, demo.builder);
});

const derive = (body: object, agent = builder, csrf = token) => agent.post('/api/geometry/derive').set('X-CSRF-Token', csrf).send(body);

describe('POST /api/geometry/derive', () => {
  it('returns per member and per node values and the model’s geometry facts', async () => {
    const res = await derive({ specification: cageSpec() }).expect(200);
    const g = res.body.geometry;
    const hoop = g.members.find((m: { memberId: string }) => m.memberId === 'mh');
    // Two legs of 1150, a top of 1200, two 90° corners of CLR 150: 2·1150 + 1200 − 4·150 + π·150 (computed).
    expect(hoop).toMatchObject({ name: 'main hoop', side: 'centre', driverSide: null, developedLengthMm: expect.closeTo(2900 + 150 * Math.PI, 6) });
    expect(hoop.bends).toEqual([
      { nodeId: 'tl', angleDeg: expect.closeTo(90, 9), clrMm: 150, clrOverOd: expect.closeTo(150 / 45, 9), setbackMm: expect.closeTo(150, 9), arcMm: expect.closeTo(75 * Math.PI, 9) },
      { nodeId: 'tr', angleDeg: expect.closeTo(90, 9), clrMm: 150, clrOverOd: expect.closeTo(150 / 45, 9), setbackMm: expect.closeTo(150, 9), arcMm: expect.closeTo(75 * Math.PI, 9) },
    ]);
    expect(g.members.find((m: { memberId: string }) => m.memberId === 'bsr')).toMatchObject({ side: 'right', driverSide: 'driver' });
    const jl = g.nodes.find((n: { nodeId: string }) => n.nodeId === 'jl');
    expect(jl.members.map((m: { name: string }) => m.name)).toEqual(['main hoop', 'backstay left', 'hoop diagonal']);
    expect(g.facts['geometry.mainHoopInsideWidthMm']).toEqual({ value: 1155, members: ['main hoop'] });
    expect(g.disagreements).toEqual([]);
  });

  it('reports a typed value that disagrees with the model', async () => {
    const spec = { ...cageSpec(), geometry: { mainHoopInsideWidthMm: 1100 } };
    const res = await derive({ specification: spec }).expect(200);
    expect(res.body.geometry.disagreements).toEqual([{
      fact: 'geometry.mainHoopInsideWidthMm', label: 'main hoop inside width at the feet', dimension: 'length',
      modelValue: 1155, sheetValue: 1100, toleranceCanonical: 10, memberId: null, members: ['main hoop'],
    }]);
  });

  it('refuses invalid input at its path', async () => {
    const spec = cageSpec();
    spec.members[1].path[1].nodeId = 'nowhere';
    spec.model.nodes[0].zMm = 51000;
    const res = await derive({ specification: spec }).expect(400);
    expect(res.body).toEqual(errorBody({
      error: {
        code: 'validation_failed',
        message: 'Some fields are invalid.',
        details: [
          { path: 'specification.model.nodes.0.zMm', message: 'More than 5 m from the origin: check the units (the model is in millimetres)' },
          { path: 'specification.members.1.path.1.nodeId', message: 'No node has the id "nowhere".' },
        ],
      },
    }));
  });

  it('answers 401 when signed out and 403 without the CSRF token', async () => {
    await agentFor(app).post('/api/geometry/derive').send({ specification: cageSpec() }).expect(403);
    const anon = agentFor(app);
    const anonToken = (await anon.get('/api/auth/csrf')).body.token as string;
    await derive({ specification: cageSpec() }, anon, anonToken).expect(401).expect(hasErrorBody({ error: { code: 'unauthenticated', message: 'Please sign in.' } }));
  });
});

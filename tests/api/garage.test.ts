// Cars in the builder's garage: create, list with each sheet's latest verdict, edit, archive and
// unarchive, delete only without sheets; another person's car is 404, never 403.
import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { errorOf, hasErrorBody, makeTestApp, useTestDatabase } from './helpers';
import { carWithSheet, everyone, garageFixture, type GarageFixture } from './garage-fixtures';

const db = useTestDatabase();
const carNotFound = { error: { code: 'not_found', message: 'Car not found.' } };

let app: ReturnType<typeof makeTestApp>;
let fx: GarageFixture;
let who: Awaited<ReturnType<typeof everyone>>;

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await garageFixture(db.ds);
  who = await everyone(app);
});

describe('cars', () => {
  let carId: string;

  it('starts with an empty garage', async () => {
    await who.builder.agent.get('/api/cars').expect(200, { cars: [] });
  });

  it('creates a car, trimming text and treating blank text as none', async () => {
    const res = await who.builder.agent.post('/api/cars').set('X-CSRF-Token', who.builder.token)
      .send({ name: '  Blue Hatch ', make: 'Varden', model: '', year: 1989, chassisType: 'unibody', raceNumber: '12' }).expect(201);
    expect(res.body.car).toMatchObject({ name: 'Blue Hatch', make: 'Varden', model: null, year: 1989, chassisType: 'unibody', raceNumber: '12', archivedAt: null, buildSheets: [] });
    carId = res.body.car.id;
  });

  it('refuses bad input with every field named', async () => {
    const res = await who.builder.agent.post('/api/cars').set('X-CSRF-Token', who.builder.token)
      .send({ name: '', year: 1850, chassisType: 'spaceframe', raceNumber: '12345678901', colour: 'red' }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['', 'chassisType', 'name', 'raceNumber', 'year']);
  });

  it('edits a car and lists it with its sheets’ latest verdicts', async () => {
    const res = await who.builder.agent.patch(`/api/cars/${carId}`).set('X-CSRF-Token', who.builder.token).send({ model: 'Sprite GT', year: null }).expect(200);
    expect(res.body.car).toMatchObject({ model: 'Sprite GT', year: null, name: 'Blue Hatch' });
    const { sheetId } = await carWithSheet(who.builder, fx);
    await who.builder.agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', who.builder.token).expect(201);
    const list = await who.builder.agent.get('/api/cars').expect(200);
    expect(list.body.cars.map((c: { name: string }) => c.name)).toEqual(['Blue Hatch', 'Grey Saloon']);
    const grey = list.body.cars[1];
    expect(grey.buildSheets).toEqual([expect.objectContaining({ id: sheetId, currentRevision: 1, latestCheckedRevision: 1, latestVerdict: expect.stringMatching(/^(pass|fail|needs_information)$/) })]);
  });

  it('archives and unarchives; archived cars show only when asked for', async () => {
    const t = who.builder.token;
    const archived = await who.builder.agent.post(`/api/cars/${carId}/archive`).set('X-CSRF-Token', t).expect(200);
    expect(archived.body.car.archivedAt).not.toBeNull();
    expect((await who.builder.agent.get('/api/cars')).body.cars.map((c: { id: string }) => c.id)).not.toContain(carId);
    expect((await who.builder.agent.get('/api/cars?show=archived')).body.cars.map((c: { id: string }) => c.id)).toEqual([carId]);
    await who.builder.agent.post(`/api/cars/${carId}/build-sheets`).set('X-CSRF-Token', t)
      .send({ name: 'X', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon' }).expect(409);
    const back = await who.builder.agent.post(`/api/cars/${carId}/unarchive`).set('X-CSRF-Token', t).expect(200);
    expect(back.body.car.archivedAt).toBeNull();
    await who.builder.agent.get('/api/cars?show=sideways').expect(400);
  });

  it('deletes a car without sheets, and refuses one with sheets (archive it instead)', async () => {
    const t = who.builder.token;
    const list = await who.builder.agent.get('/api/cars').expect(200);
    const grey = list.body.cars.find((c: { name: string }) => c.name === 'Grey Saloon');
    const refused = await who.builder.agent.delete(`/api/cars/${grey.id}`).set('X-CSRF-Token', t).expect(409);
    expect(refused.body.error).toEqual(errorOf({ code: 'conflict', message: 'This car has 1 build sheet, so it cannot be deleted. Archive it instead.', details: { buildSheets: 1 } }));
    await who.builder.agent.delete(`/api/cars/${carId}`).set('X-CSRF-Token', t).expect(204);
    await who.builder.agent.get(`/api/cars/${carId}`).expect(404).expect(hasErrorBody(carNotFound));
  });

  it.each(['otherBuilder', 'steward', 'admin', 'outsider'] as const)('gives the %s 404 for someone else’s car, whatever the action', async (role) => {
    const list = await who.builder.agent.get('/api/cars').expect(200);
    const id = list.body.cars[0].id;
    const { agent, token } = who[role];
    await agent.get(`/api/cars/${id}`).expect(404).expect(hasErrorBody(carNotFound));
    await agent.patch(`/api/cars/${id}`).set('X-CSRF-Token', token).send({ name: 'Taken' }).expect(404).expect(hasErrorBody(carNotFound));
    await agent.post(`/api/cars/${id}/archive`).set('X-CSRF-Token', token).expect(404).expect(hasErrorBody(carNotFound));
    await agent.delete(`/api/cars/${id}`).set('X-CSRF-Token', token).expect(404).expect(hasErrorBody(carNotFound));
    await agent.post(`/api/cars/${id}/build-sheets`).set('X-CSRF-Token', token)
      .send({ name: 'X', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon' }).expect(404).expect(hasErrorBody(carNotFound));
    expect((await agent.get('/api/cars').expect(200)).body.cars).toEqual([]);
  });

  it('answers 401 signed out, 403 without a CSRF token, 404 for an unknown car', async () => {
    await request(app).get('/api/cars').expect(401);
    await who.builder.agent.post('/api/cars').send({ name: 'X', chassisType: 'unibody' }).expect(403);
    await who.builder.agent.get(`/api/cars/${randomUUID()}`).expect(404).expect(hasErrorBody(carNotFound));
  });
});

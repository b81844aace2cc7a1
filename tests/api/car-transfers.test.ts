// Selling a car (issue 13 §3): the seller offers it by e-mail to a member of the same club, the buyer
// accepts it (the car moves to their garage with its sheets, runs, reports, submissions and cage records)
// or declines it, the seller may withdraw the offer; a club admin moves a car of the club outright. Each
// rule's refusals: to yourself, to a non-member or an unknown address, someone else accepting, accepting
// twice, a second open offer, a car with a review waiting, an admin of another club. Every step is in the
// club's activity log and mails the person who should hear of it.
import { beforeAll, describe, expect, it } from 'vitest';
import type { SignedIn } from './garage-fixtures';
import { carWithSheet, people } from './garage-fixtures';
import { errorBody, makeTestApp, useTestDatabase } from './helpers';
import { outboxRows } from './mail-helpers';
import { act, reviewFixture, submitNew, type ReviewFixture } from './review-fixtures';

const db = useTestDatabase();
let app: ReturnType<typeof makeTestApp>;
let fx: ReviewFixture;
const post = (who: SignedIn, url: string, body?: object) => who.agent.post(url).set('X-CSRF-Token', who.token).send(body);
const offer = (who: SignedIn, carId: string, email: string) => post(who, `/api/cars/${carId}/transfer-offers`, { email });
const carIdsOf = async (who: SignedIn) => ((await who.agent.get('/api/cars').expect(200)).body.cars as { id: string }[]).map((c) => c.id);
const entries = async (transferId: string) =>
  (await db.ds.query(`SELECT action, actor_id, club_id, details FROM audit_entries WHERE entity_type = 'car_transfer' AND entity_id = $1 ORDER BY created_at`, [transferId])) as { action: string; club_id: string; details: Record<string, unknown> }[];

beforeAll(async () => {
  app = makeTestApp(db.ds);
  fx = await reviewFixture(db.ds, app);
});

/** A car of the demo builder with an approved submission and its cage record. */
async function approvedCar() {
  const s = await submitNew(fx.who.builder, fx);
  expect((await act(fx.who.steward, s.submissionId, { type: 'claim' })).status).toBe(200);
  const approved = await act(fx.who.steward, s.submissionId, { type: 'approve' });
  expect(approved.status).toBe(200);
  return { ...s, recordId: approved.body.submission.record.id as string };
}

describe('the seller offers, the buyer accepts', () => {
  it('moves the car with its sheets, runs, reports, submissions and records; both are mailed; the log says so', async () => {
    const { builder, otherBuilder } = fx.who;
    const car = await approvedCar();
    const before = (await outboxRows(db.ds)).length;
    const offered = await offer(builder, car.carId, '  Builder2@Tarnwick.example ');
    expect(offered.status, JSON.stringify(offered.body)).toBe(201);
    const t = offered.body.transfer;
    expect(t).toMatchObject({ state: 'offered', car: { id: car.carId, name: 'Grey Saloon', sheets: 1, records: 1 }, from: { displayName: 'Robin Ashcombe' }, to: { email: people.otherBuilder } });
    expect((await outboxRows(db.ds)).slice(before)).toEqual([expect.objectContaining({ to_address: people.otherBuilder, subject: 'Robin Ashcombe offers you Grey Saloon' })]);
    expect((await otherBuilder.agent.get('/api/car-transfers').expect(200)).body).toMatchObject({ incoming: [{ id: t.id }], outgoing: [] });
    expect((await builder.agent.get('/api/car-transfers').expect(200)).body).toMatchObject({ incoming: [], outgoing: [{ id: t.id }] });
    // Until accepted, nothing moves.
    expect(await carIdsOf(otherBuilder)).not.toContain(car.carId);

    const accepted = await post(otherBuilder, `/api/car-transfers/${t.id}/accept`);
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    expect(accepted.body.transfer.state).toBe('accepted');
    expect(await carIdsOf(otherBuilder)).toContain(car.carId);
    expect(await carIdsOf(builder)).not.toContain(car.carId);
    await builder.agent.get(`/api/cars/${car.carId}`).expect(404);
    const moved = (await otherBuilder.agent.get(`/api/cars/${car.carId}`).expect(200)).body.car;
    expect(moved.buildSheets.map((s: { id: string }) => s.id)).toEqual([car.sheetId]);
    await otherBuilder.agent.get(`/api/build-sheets/${car.sheetId}`).expect(200);
    await otherBuilder.agent.get(`/api/cage-records/${car.recordId}`).expect(200);
    await otherBuilder.agent.get(`/api/check-runs/${car.runId}`).expect(200);
    const pdf = await otherBuilder.agent.get(`/api/check-runs/${car.runId}/report.pdf`).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    await otherBuilder.agent.get(`/api/submissions/${car.submissionId}`).expect(200);
    await builder.agent.get(`/api/cage-records/${car.recordId}`).expect(404);
    expect((await outboxRows(db.ds)).at(-1)).toMatchObject({ to_address: 'builder@tarnwick.example', subject: 'Sam Okafor accepted Grey Saloon' });

    const log = await entries(t.id);
    expect(log.map((e) => [e.action, e.club_id])).toEqual([['car.transfer_offered', fx.clubId], ['car.transfer_accepted', fx.clubId]]);
    expect(log[1]!.details).toMatchObject({ carId: car.carId, carName: 'Grey Saloon', otherName: 'Robin Ashcombe' });

    // Accepting twice, or the seller withdrawing after, is refused with the reason.
    const twice = await post(otherBuilder, `/api/car-transfers/${t.id}/accept`);
    expect(twice.status).toBe(409);
    expect(twice.body).toEqual(errorBody({ error: { code: 'conflict', message: 'This offer has already been accepted: the car has moved.', details: { reason: 'not_open', state: 'accepted' } } }));
    expect((await post(builder, `/api/car-transfers/${t.id}/withdraw`)).status).toBe(409);
  });
});

describe('refusals', () => {
  it('refuses an offer to yourself, to someone in no club of the car, and to an unknown address, and changes nothing', async () => {
    const { builder } = fx.who;
    const { carId } = await carWithSheet(builder, fx);
    const self = await offer(builder, carId, 'builder@tarnwick.example');
    expect(self.status).toBe(400);
    expect(self.body.error.details).toEqual([{ path: 'email', message: 'That is your own address: this car is yours already. Give the buyer’s e-mail address.' }]);
    for (const email of [people.outsider, 'nobody-at-all@tarnwick.example']) {
      const res = await offer(builder, carId, email);
      expect(res.status).toBe(400);
      // The same words whether or not the address has an account: nobody learns who uses Cagewright.
      expect(res.body.error.details[0]).toEqual({ path: 'email', message: `No member of Tarnwick Vale Motor Club has the e-mail address ${email}. The car has build sheets there, so its new owner must belong to that club: ask its admin to invite them, then offer the car again. The car stays where it is.` });
    }
    expect((await builder.agent.get('/api/car-transfers').expect(200)).body.outgoing).toEqual([]);
  });

  it('refuses someone else accepting, a second open offer, the buyer withdrawing; the seller withdraws and the buyer is told', async () => {
    const { builder, otherBuilder, steward, outsider } = fx.who;
    const { carId } = await carWithSheet(builder, fx);
    const t = (await offer(builder, carId, people.otherBuilder).expect(201)).body.transfer;
    const own = await post(builder, `/api/car-transfers/${t.id}/accept`);
    expect(own.status).toBe(403);
    expect(own.body.error.message).toBe('Only the person the car is offered to can accept it.');
    expect((await post(steward, `/api/car-transfers/${t.id}/accept`)).status).toBe(404);
    expect((await post(outsider, `/api/car-transfers/${t.id}/decline`)).status).toBe(404);
    expect((await post(otherBuilder, `/api/car-transfers/${t.id}/withdraw`)).status).toBe(403);
    const second = await offer(builder, carId, 'admin@tarnwick.example');
    expect(second.status).toBe(409);
    expect(second.body.error).toMatchObject({ message: 'You have already offered Grey Saloon to Sam Okafor. Withdraw that offer first.', details: { reason: 'already_offered', transferId: t.id } });
    // Someone else's car cannot be offered at all.
    expect((await offer(otherBuilder, carId, 'admin@tarnwick.example')).status).toBe(404);

    const withdrawn = await post(builder, `/api/car-transfers/${t.id}/withdraw`);
    expect(withdrawn.status).toBe(200);
    expect((await outboxRows(db.ds)).at(-1)).toMatchObject({ to_address: people.otherBuilder, subject: 'Robin Ashcombe withdrew the offer of Grey Saloon' });
    const late = await post(otherBuilder, `/api/car-transfers/${t.id}/accept`);
    expect(late.status).toBe(409);
    expect(late.body.error.message).toBe('The seller withdrew this offer.');
    expect(await carIdsOf(builder)).toContain(carId);
    expect((await entries(t.id)).map((e) => e.action)).toEqual(['car.transfer_offered', 'car.transfer_withdrawn']);
  });

  it('the buyer declines: the car stays, the seller is told, and a new offer may follow', async () => {
    const { builder, otherBuilder } = fx.who;
    const { carId } = await carWithSheet(builder, fx);
    const t = (await offer(builder, carId, people.otherBuilder).expect(201)).body.transfer;
    expect((await post(otherBuilder, `/api/car-transfers/${t.id}/decline`)).status).toBe(200);
    expect((await outboxRows(db.ds)).at(-1)).toMatchObject({ to_address: 'builder@tarnwick.example', subject: 'Sam Okafor declined Grey Saloon' });
    expect(await carIdsOf(builder)).toContain(carId);
    expect((await post(otherBuilder, `/api/car-transfers/${t.id}/accept`)).status).toBe(409);
    expect((await offer(builder, carId, people.otherBuilder)).status).toBe(201);
  });

  it('a car with a review waiting cannot change hands until the decision', async () => {
    const { builder } = fx.who;
    const s = await submitNew(builder, fx);
    const res = await offer(builder, s.carId, people.otherBuilder);
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ message: 'Grey Saloon has a submission waiting for a steward. Withdraw it, or wait for the decision, before the car changes hands.', details: { reason: 'review_open' } });
  });

  it('a car without build sheets goes to someone who shares a club with the seller', async () => {
    const { builder, otherBuilder, outsider } = fx.who;
    const carId = (await post(builder, '/api/cars', { name: 'Bare shell', chassisType: 'unibody' }).expect(201)).body.car.id as string;
    expect((await offer(builder, carId, people.outsider)).body.error.details[0].message).toContain('None of your clubs has a member with the e-mail address');
    const t = (await offer(builder, carId, people.otherBuilder).expect(201)).body.transfer;
    expect((await entries(t.id)).map((e) => e.club_id)).toEqual([fx.clubId]);
    expect((await post(otherBuilder, `/api/car-transfers/${t.id}/accept`)).status).toBe(200);
    expect(await carIdsOf(otherBuilder)).toContain(carId);
    expect(await carIdsOf(outsider)).toEqual([]);
  });
});

describe('a club admin moves a car of the club', () => {
  it('lists the club’s cars, moves one to another member at once, cancels an open offer, mails both owners', async () => {
    const { builder, admin, otherBuilder } = fx.who;
    const { carId } = await carWithSheet(builder, fx);
    const pending = (await offer(builder, carId, 'admin@tarnwick.example').expect(201)).body.transfer;
    const cars = (await admin.agent.get(`/api/clubs/${fx.clubId}/cars`).expect(200)).body.cars as { id: string; owner: { email: string }; openOffer: boolean; sheets: number }[];
    expect(cars.find((c) => c.id === carId)).toMatchObject({ owner: { email: 'builder@tarnwick.example' }, openOffer: true, sheets: 1 });
    const toUserId = ((await db.ds.query(`SELECT id FROM users WHERE email = $1`, [people.otherBuilder])) as { id: string }[])[0]!.id;
    const ownerId = ((await db.ds.query(`SELECT owner_id FROM cars WHERE id = $1`, [carId])) as { owner_id: string }[])[0]!.owner_id;

    const same = await post(admin, `/api/clubs/${fx.clubId}/cars/${carId}/transfer`, { toUserId: ownerId });
    expect(same.status).toBe(400);
    expect(same.body.error.details).toEqual([{ path: 'toUserId', message: 'This member owns the car already.' }]);
    const outsiderId = ((await db.ds.query(`SELECT id FROM users WHERE email = $1`, [people.outsider])) as { id: string }[])[0]!.id;
    expect((await post(admin, `/api/clubs/${fx.clubId}/cars/${carId}/transfer`, { toUserId: outsiderId })).status).toBe(400);
    // Only the club's admins; an admin of another club does not see the car at all.
    expect((await post(fx.who.steward, `/api/clubs/${fx.clubId}/cars/${carId}/transfer`, { toUserId })).status).toBe(403);
    const elsewhere = ((await db.ds.query(`SELECT id FROM clubs WHERE slug = 'elsewhere-mc'`)) as { id: string }[])[0]!.id;
    expect((await post(fx.who.foreignSteward, `/api/clubs/${elsewhere}/cars/${carId}/transfer`, { toUserId })).status).toBe(404);

    const before = (await outboxRows(db.ds)).length;
    const moved = await post(admin, `/api/clubs/${fx.clubId}/cars/${carId}/transfer`, { toUserId });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    expect(moved.body.transfer).toMatchObject({ state: 'transferred', from: { email: 'builder@tarnwick.example' }, to: { email: people.otherBuilder } });
    expect(await carIdsOf(otherBuilder)).toContain(carId);
    expect(await carIdsOf(builder)).not.toContain(carId);
    const mails = (await outboxRows(db.ds)).slice(before).map((m) => [m.to_address, m.subject]);
    expect(mails).toEqual(expect.arrayContaining([
      ['admin@tarnwick.example', 'The offer of Grey Saloon no longer stands'],
      [people.otherBuilder, 'Grey Saloon is now in your garage'],
      ['builder@tarnwick.example', 'Grey Saloon has moved to Sam Okafor'],
    ]));
    const late = await post(admin, `/api/car-transfers/${pending.id}/accept`);
    expect(late.status).toBe(409);
    expect(late.body.error.message).toBe('This offer no longer stands: a club admin moved the car.');
    const [entry] = await entries(moved.body.transfer.id);
    expect(entry).toMatchObject({ action: 'car.transferred', club_id: fx.clubId, details: { carId, otherName: 'Sam Okafor', fromName: 'Robin Ashcombe', userId: toUserId } });
  });
});

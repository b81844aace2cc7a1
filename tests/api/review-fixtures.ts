// Shared set-up of the review API tests: the garage fixture's people plus a steward of another club,
// a car with a sheet (optionally a failing one), a saved check run and its submission, and a
// shorthand for workflow actions that carry the state and version last seen.
import type { Express } from 'express';
import type { DataSource } from 'typeorm';
import { expect } from 'vitest';
import { hashPassword } from '../../backend/src/services/passwords';
import { as, carWithSheet, everyone, garageFixture, otherPassword, type GarageFixture, type SignedIn } from './garage-fixtures';

export const elsewhereSteward = 'steward@elsewhere.example';

export interface ReviewFixture extends GarageFixture {
  who: Awaited<ReturnType<typeof everyone>> & { foreignSteward: SignedIn };
}

export async function reviewFixture(ds: DataSource, app: Express): Promise<ReviewFixture> {
  const fx = await garageFixture(ds);
  const club = await ds.query(`INSERT INTO clubs (slug, name) VALUES ('elsewhere-mc', 'Elsewhere Motor Club') RETURNING id`);
  const user = await ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, 'Kit Varro', $2) RETURNING id`, [elsewhereSteward, await hashPassword(otherPassword)]);
  await ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{steward,admin}')`, [user[0].id, club[0].id]);
  const who = { ...(await everyone(app)), foreignSteward: await as(app, elsewhereSteward) };
  return { ...fx, who };
}

const IN = 25.4; // F-UNIT-1: 1 in = 25.4 mm exactly
const tube = (id: string, kind: string, odIn: number, wallIn: number, extra: Record<string, unknown> = {}) => ({
  id, kind, odMm: odIn * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom', ...extra,
});
const hoopBends = { bends: [{ clrMm: 6 * IN, minOdMm: 1.7 * IN, maxOdMm: 1.78 * IN }] };

/**
 * The complete demo club-saloon specification of tests/api/checks.test.ts, built to pass: 2,400 lb
 * with driver, 1.750 × 0.095 in hoops (F-SCCA-T3: 2,201–3,000 lb 1.750 × .095). `doorBarWallIn`
 * makes the door bars fail on their wall.
 */
export function passingSpec(doorBarWallIn = 0.095) {
  return {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 2400 * 0.45359237, cockpit: 'closed', chassis: 'unibody' },
    members: [
      tube('mh', 'main_hoop', 1.75, 0.095, { continuousPiece: true, ...hoopBends }), tube('fh', 'front_hoop', 1.75, 0.095, hoopBends),
      tube('rb1', 'rear_brace', 1.75, 0.095), tube('rb2', 'rear_brace', 1.75, 0.095),
      tube('db1', 'door_bar', 1.5, doorBarWallIn, { bends: [] }), tube('db2', 'door_bar', 1.5, doorBarWallIn, { bends: [] }),
      tube('dg', 'diagonal', 1.5, 0.095), tube('hb', 'harness_bar', 1.5, 0.095),
    ],
    geometry: { rearBraceAttachBelowTopMm: 3 * IN, rearBraceAngleFromVerticalDeg: 40, helmetBelowHoopLineMm: 2 * IN, harnessBarBelowShouldersMm: 1 * IN, nearestTubeToHelmetMm: 10 * IN },
    plates: [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [6 * IN, 6 * IN], thicknessMm: 0.125 * IN }],
    inspectionHoles: [{ memberId: 'mh', diameterMm: (3 / 16) * IN, distanceFromWeldOrBendMm: 4 * IN }],
  };
}

/** Door bars of 0.049 in wall, well under the demo rulebook's minimum, so the check fails on them. */
export const failingSpec = () => passingSpec(0.049);

export async function savedRun(owner: SignedIn, sheetId: string): Promise<string> {
  const res = await owner.agent.post(`/api/build-sheets/${sheetId}/check-runs`).set('X-CSRF-Token', owner.token).expect(201);
  return res.body.checkRun.id as string;
}

export interface Submitted {
  carId: string;
  sheetId: string;
  runId: string;
  submissionId: string;
  body: Record<string, unknown>;
}

export async function submitNew(owner: SignedIn, fx: GarageFixture, spec: unknown = passingSpec(), note = 'First cage, ready for a look.'): Promise<Submitted> {
  const { carId, sheetId } = await carWithSheet(owner, fx, spec);
  const runId = await savedRun(owner, sheetId);
  const res = await owner.agent.post('/api/submissions').set('X-CSRF-Token', owner.token).send({ checkRunId: runId, note });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return { carId, sheetId, runId, submissionId: res.body.submission.id as string, body: res.body.submission };
}

export async function current(who: SignedIn, submissionId: string): Promise<{ state: string; version: number } & Record<string, unknown>> {
  const res = await who.agent.get(`/api/submissions/${submissionId}`).expect(200);
  return res.body.submission;
}

/** Sends an action with the state and version the caller sees now (or `expected`). */
export async function act(who: SignedIn, submissionId: string, action: Record<string, unknown>, expected?: { state: string; version: number }) {
  const seen = expected ?? (await current(who, submissionId));
  return who.agent.post(`/api/submissions/${submissionId}/actions`).set('X-CSRF-Token', who.token)
    .send({ ...action, expected: { state: seen.state, version: seen.version } });
}

// Shared set-up of the garage API tests: the demo club's published cage rulebook, extra people
// (a second builder of the club, a steward, and someone in no club), signed-in agents, a car with
// a sheet, a specification for the demo saloon class, and test photos made with sharp.
import type { Express } from 'express';
import sharp from 'sharp';
import type { DataSource } from 'typeorm';
import { expect } from 'vitest';
import { hashPassword } from '../../backend/src/services/passwords';
import { agentFor, demo, demoClubId, signIn, type Agent } from './helpers';

export const otherPassword = 'other-person-password';
export const people = { otherBuilder: 'builder2@tarnwick.example', outsider: 'nobody@elsewhere.example' } as const;

export interface GarageFixture {
  clubId: string;
  versionId: string;
  rulebookId: string;
}

/** The demo club, its published cage rulebook version, and the extra people. Run once per file. */
export async function garageFixture(ds: DataSource): Promise<GarageFixture> {
  const clubId = await demoClubId(ds);
  const rows: { id: string; rulebookId: string }[] = await ds.query(
    `SELECT v.id, v.rulebook_id AS "rulebookId" FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id
     WHERE r.club_id = $1 AND r.slug = 'tarnwick-vale-mc-cage-regulations-2027' AND v.status = 'published'`,
    [clubId],
  );
  expect(rows).toHaveLength(1);
  const hash = await hashPassword(otherPassword);
  const other = await ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, 'Sam Okafor', $2) RETURNING id`, [people.otherBuilder, hash]);
  await ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{builder}')`, [other[0].id, clubId]);
  await ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, 'Lee Marr', $2)`, [people.outsider, hash]);
  return { clubId, versionId: rows[0]!.id, rulebookId: rows[0]!.rulebookId };
}

export interface SignedIn {
  agent: Agent;
  token: string;
}

export async function as(app: Express, email: string): Promise<SignedIn> {
  const agent = agentFor(app);
  const token = await signIn(agent, email, email.endsWith('@tarnwick.example') && email !== people.otherBuilder ? undefined : otherPassword);
  return { agent, token };
}

export async function everyone(app: Express) {
  return {
    builder: await as(app, demo.builder),
    steward: await as(app, demo.steward),
    admin: await as(app, demo.admin),
    otherBuilder: await as(app, people.otherBuilder),
    outsider: await as(app, people.outsider),
  };
}

/** 1.750 × 0.095 in hoops for the demo saloon class (F-UNIT-1: 1 in = 25.4 mm exactly). */
export function saloonSpec(overrides: { doorBarWallMm?: number } = {}) {
  const hoop = { odMm: 44.45, wallMm: 2.413, material: 'mild_steel', process: 'dom' };
  const bar = { odMm: 38.1, wallMm: overrides.doorBarWallMm ?? 2.413, material: 'mild_steel', process: 'dom' };
  return {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: 1200, chassis: 'unibody', cockpit: 'closed' },
    members: [
      { id: 'mh', kind: 'main_hoop', ...hoop, lengthMm: 3350, continuousPiece: true },
      { id: 'fh', kind: 'front_hoop', ...hoop, lengthMm: 3900 },
      { id: 'rb-l', kind: 'rear_brace', ...hoop, lengthMm: 1150 },
      { id: 'rb-r', kind: 'rear_brace', ...hoop, lengthMm: 1150 },
      { id: 'hb', kind: 'harness_bar', ...bar, lengthMm: 1180 },
      { id: 'db-l', kind: 'door_bar', ...bar, lengthMm: 1020 },
      { id: 'db-r', kind: 'door_bar', ...bar, lengthMm: 1020 },
      { id: 'dg', kind: 'diagonal', ...bar },
    ],
    geometry: { rearBraceAttachBelowTopMm: 100, rearBraceAngleFromVerticalDeg: 38, helmetBelowHoopLineMm: 50 },
    padding: { nearHelmet: true, standard: 'sfi_45_1' },
    welding: { process: 'mig' },
  };
}

/** Creates a car and a sheet on it for the signed-in builder; returns their ids. */
export async function carWithSheet(owner: SignedIn, fx: GarageFixture, specification: unknown = saloonSpec()): Promise<{ carId: string; sheetId: string }> {
  const car = await owner.agent.post('/api/cars').set('X-CSRF-Token', owner.token)
    .send({ name: 'Grey Saloon', make: 'Varden', model: 'Corsair', year: 1994, chassisType: 'unibody', raceNumber: '47' }).expect(201);
  const sheet = await owner.agent.post(`/api/cars/${car.body.car.id}/build-sheets`).set('X-CSRF-Token', owner.token)
    .send({ name: 'Full cage 2027', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification }).expect(201);
  return { carId: car.body.car.id as string, sheetId: sheet.body.buildSheet.id as string };
}

export async function testJpeg(width = 640, height = 480): Promise<Buffer> {
  return sharp({ create: { width, height, channels: 3, background: { r: 120, g: 130, b: 140 } } })
    .withExif({ IFD0: { Make: 'TestCam' }, IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1' } })
    .jpeg()
    .toBuffer();
}

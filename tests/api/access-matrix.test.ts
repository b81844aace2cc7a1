// The access matrix (issue 12, §5): every route the app mounts × seven kinds of caller × the ownership of
// the thing it names gives the answer of the route's access rule. The routes come from Express's own
// router (tests/api/support/mounted-routes.ts), each with the rule its route table names; the answers
// come from EXPECT below, written out by hand from docs/api.md's "Who may do what", independent of
// backend/src/domain/access-policy.ts. A route mounted without route(), a rule with no row here, or a
// route that takes input and has no request below fails the test, so a new route cannot slip past.
//
// The things all belong to the demo club's builder (the owner) in the demo club. A second builder of
// that club, its steward and its admin (also a steward), a steward and an admin of another club, and
// a signed-out caller ask for them; so does everyone for an id that does not exist (the same 404).
import type { Express } from 'express';
import request from 'supertest';
import { beforeAll, describe, expect, it } from 'vitest';
import { ACCESS_RULES } from '../../backend/src/domain/access-policy';
import { findingKey } from '../../backend/src/domain/review/waivers';
import { demoPassword } from '../../backend/src/db/seed-data';
import { createMailboxService } from '../../backend/src/services/mail';
import { hashPassword } from '../../backend/src/services/passwords';
import { as, carWithSheet, garageFixture, otherPassword, people, saloonSpec, testJpeg, type GarageFixture, type SignedIn } from './garage-fixtures';
import { agentFor, csrfToken, demo, makeTestApp, testConfig, useTestDatabase } from './helpers';
import { act, current, passingSpec, savedRun } from './review-fixtures';
import { mountedRoutes, routeKey, type MountedRoute } from './support/mounted-routes';

const db = useTestDatabase();

const actors = ['anonymous', 'owner', 'otherBuilder', 'steward', 'otherSteward', 'admin', 'otherAdmin'] as const;
type Actor = (typeof actors)[number];
type Cell = 401 | 403 | 404 | 'ok';

const emails: Record<Exclude<Actor, 'anonymous'>, string> = {
  owner: demo.builder,
  otherBuilder: people.otherBuilder,
  steward: demo.steward,
  otherSteward: 'steward@fenmoor.example',
  admin: demo.admin, // admin and steward of the demo club
  otherAdmin: 'admin@fenmoor.example',
};
const passwordOf = (a: Exclude<Actor, 'anonymous'>) => (emails[a].endsWith('@tarnwick.example') && a !== 'otherBuilder' ? demoPassword : otherPassword);

const row = (...cells: [Cell, Cell, Cell, Cell, Cell, Cell, Cell]) => Object.fromEntries(actors.map((a, i) => [a, cells[i]])) as Record<Actor, Cell>;

/**
 * Who gets what, by rule (columns: signed out, owner, other builder, steward, steward of another club,
 * admin, admin of another club). `:own` is a route that names the caller's own thing (someone else's
 * is not found); `:draft` a ruleset version that is still a draft (only admins know it exists).
 */
const EXPECT: Record<string, Record<Actor, Cell>> = {
  public: row('ok', 'ok', 'ok', 'ok', 'ok', 'ok', 'ok'),
  signedIn: row(401, 'ok', 'ok', 'ok', 'ok', 'ok', 'ok'),
  'signedIn:own': row(401, 'ok', 404, 404, 404, 404, 404),
  'self.builder': row(401, 'ok', 'ok', 403, 403, 403, 403),
  'self.builder:own': row(401, 'ok', 404, 403, 403, 403, 403),
  'club.member': row(401, 'ok', 'ok', 'ok', 404, 'ok', 404),
  'club.reviewer': row(401, 403, 403, 'ok', 404, 'ok', 404),
  'club.steward': row(401, 403, 403, 'ok', 404, 'ok', 404),
  'club.admin': row(401, 403, 403, 403, 404, 'ok', 404),
  'anyClub.admin': row(401, 403, 403, 403, 403, 'ok', 'ok'),
  'car.owner': row(401, 'ok', 404, 404, 404, 404, 404),
  'car.addSheet': row(401, 'ok', 404, 404, 404, 404, 404),
  'sheet.read': row(401, 'ok', 404, 'ok', 404, 'ok', 404),
  'sheet.edit': row(401, 'ok', 404, 403, 404, 403, 404),
  'checkRun.read': row(401, 'ok', 404, 'ok', 404, 'ok', 404),
  'version.read': row(401, 'ok', 'ok', 'ok', 404, 'ok', 404),
  'version.admin': row(401, 403, 403, 403, 404, 'ok', 404),
  'version.admin:draft': row(401, 404, 404, 404, 404, 'ok', 404),
  'rulebook.admin': row(401, 403, 403, 403, 404, 'ok', 404),
  'submission.create': row(401, 'ok', 404, 403, 404, 403, 404),
  'submission.read': row(401, 'ok', 404, 'ok', 404, 'ok', 404),
  'submission.act': row(401, 'ok', 404, 'ok', 404, 'ok', 404),
  'submission.resubmit': row(401, 'ok', 404, 403, 404, 403, 404),
  'submission.annotate': row(401, 403, 404, 'ok', 404, 'ok', 404),
  'record.read': row(401, 'ok', 404, 'ok', 404, 'ok', 404),
  'record.revoke': row(401, 403, 404, 'ok', 404, 'ok', 404),
  'record.inspect': row(401, 403, 404, 'ok', 404, 'ok', 404),
  'job.admin': row(401, 403, 403, 403, 404, 'ok', 404),
  // A car the owner offered to the other builder of the club.
  'transfer.recipient': row(401, 403, 'ok', 404, 404, 404, 404),
  'transfer.sender': row(401, 'ok', 403, 404, 404, 404, 404),
};

interface Req {
  params?: Record<string, string>;
  body?: unknown;
  query?: Record<string, string>;
  /** Send a JPEG as the multipart field `photos` (with one caption) instead of a JSON body. */
  photo?: boolean;
}

interface Fixture {
  variant?: 'own' | 'draft';
  /** The status an allowed caller gets (default 200), per caller where the workflow or the state decides. */
  ok?: number | Partial<Record<Actor, number>>;
  /** The request, made just before each call (a fresh invitation, the lock version as it is now). */
  req?: (actor: Actor) => Req | Promise<Req>;
  /** Each call on a session of its own (the route signs in or out). */
  fresh?: boolean;
  /** After every other route: it ends the caller's other sessions. */
  last?: boolean;
}

let app: Express;
let fx: GarageFixture;
const who = {} as Record<Actor, SignedIn>;
/** The ids the things of the matrix have; a route parameter of the same name gets its value. */
const ids: Record<string, string> = {};
const jobRetries: string[] = [];
let invitationCount = 0;

async function invitationToken(): Promise<string> {
  const res = await who.admin.agent.post(`/api/clubs/${fx.clubId}/members`).set('X-CSRF-Token', who.admin.token)
    .send({ email: `invited-${++invitationCount}@tarnwick.example`, roles: ['builder'] }).expect(201);
  return String(res.body.invitationUrl).split('/').pop()!;
}

let resetCount = 0;
/** A usable reset link's token, for an account of its own (using it ends that account's sessions only). */
async function resetToken(): Promise<string> {
  const email = `reset-${++resetCount}@tarnwick.example`;
  await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, 'Reset person', $2)`, [email, await hashPassword(otherPassword)]);
  const asked = agentFor(app);
  const token = await csrfToken(asked); // before the request: the agent attaches its cookies when one is made
  await asked.post('/api/auth/password-reset').set('X-CSRF-Token', token).send({ email }).expect(202);
  const [mail]: { text_body: string }[] = await db.ds.query(`SELECT text_body FROM outbox_messages WHERE to_address = $1`, [email]);
  return /\/reset-password\/([A-Za-z0-9_-]+)/.exec(mail!.text_body)![1]!;
}

async function draftLock(versionId: string): Promise<number> {
  return ((await db.ds.query(`SELECT lock_version FROM ruleset_versions WHERE id = $1`, [versionId])) as { lock_version: number }[])[0]!.lock_version;
}

async function firstFindingKey(submissionId: string): Promise<string> {
  const s = (await who.owner.agent.get(`/api/submissions/${submissionId}`).expect(200)).body.submission;
  return findingKey(s.checkRun.report.findings[0]);
}

const FIXTURES: Record<string, Fixture> = {
  'GET /api/health': {},
  'GET /api/auth/csrf': {},
  'POST /api/auth/login': { fresh: true, req: (a) => ({ body: a === 'anonymous' ? { email: demo.builder, password: demoPassword } : { email: emails[a], password: passwordOf(a) } }) },
  'POST /api/auth/logout': { fresh: true, ok: 204 },
  'GET /api/auth/me': {},
  'POST /api/auth/password': { fresh: true, last: true, ok: 204, req: (a) => (a === 'anonymous' ? { body: { currentPassword: demoPassword, newPassword: demoPassword } } : { body: { currentPassword: passwordOf(a), newPassword: passwordOf(a) } }) },
  'POST /api/auth/password-reset': { ok: 202, req: () => ({ body: { email: 'nobody-here@tarnwick.example' } }) },
  'GET /api/auth/password-reset/:token': { req: async () => ({ params: { token: await resetToken() } }) },
  'POST /api/auth/password-reset/:token': { ok: 204, req: async () => ({ params: { token: await resetToken() }, body: { password: 'a-new-reset-password' } }) },
  'PATCH /api/account': { req: () => ({ body: { preferredUnits: 'metric' } }) },
  'GET /api/invitations/:token': { req: () => ({ params: { token: ids.invitation! } }) },
  'POST /api/invitations/:token/accept': { fresh: true, req: async () => ({ params: { token: await invitationToken() }, body: { password: 'a-new-member-password' } }) },
  'GET /api/clubs/:clubId/members': {},
  'POST /api/clubs/:clubId/members': { ok: 201, req: () => ({ body: { email: `added-${++invitationCount}@tarnwick.example`, roles: ['builder'] } }) },
  'PATCH /api/clubs/:clubId/members/:userId': { req: () => ({ params: { userId: ids.spareMember! }, body: { roles: ['builder', 'steward'] } }) },
  'DELETE /api/clubs/:clubId/members/:userId': { ok: 204, req: () => ({ params: { userId: ids.leavingMember! } }) },
  'GET /api/clubs/:clubId/rulebooks': {},
  'GET /api/ruleset-versions/:versionId': { req: () => ({ params: { versionId: fx.versionId } }) },
  'POST /api/clubs/:clubId/rulebooks': { ok: 201, req: () => ({ body: { start: 'blank', title: `Matrix rulebook ${++invitationCount}`, publisher: 'Tarnwick Vale Motor Club', edition: '2028', unitSystem: 'imperial' } }) },
  'POST /api/rulebooks/:rulebookId/drafts': { ok: 201, req: () => ({ params: { rulebookId: ids.draftlessRulebook! } }) },
  'PUT /api/ruleset-drafts/:versionId': { variant: 'draft', req: async () => ({ params: { versionId: ids.draft! }, body: { lockVersion: await draftLock(ids.draft!), document: ids.draftDocument ? JSON.parse(ids.draftDocument) : {} } }) },
  'POST /api/ruleset-drafts/:versionId/import': { variant: 'draft', req: async () => ({ params: { versionId: ids.draft! }, body: { lockVersion: await draftLock(ids.draft!), text: ids.draftDocument } }) },
  'DELETE /api/ruleset-drafts/:versionId': { variant: 'draft', ok: 204, req: () => ({ params: { versionId: ids.doomedDraft! } }) },
  // This app runs no job queue: the admin is let through and told the impact cannot be worked out here.
  'POST /api/ruleset-drafts/:versionId/impact': { variant: 'draft', ok: 409, req: () => ({ params: { versionId: ids.draft! } }) },
  // A lock version older than the draft's: the admin is let through and then told someone saved since.
  'POST /api/ruleset-drafts/:versionId/publish': { variant: 'draft', ok: 409, req: async () => ({ params: { versionId: ids.draft! }, body: { lockVersion: (await draftLock(ids.draft!)) + 1000, effectiveDate: '2029-01-01' } }) },
  'POST /api/ruleset-versions/:versionId/retire': { req: () => ({ params: { versionId: ids.retirable! } }) },
  'GET /api/ruleset-versions/:versionId/compare/:otherId': { req: () => ({ params: { versionId: fx.versionId, otherId: fx.versionId } }) },
  'GET /api/ruleset-versions/:versionId/export': { req: () => ({ params: { versionId: fx.versionId } }) },
  'POST /api/checks': { req: () => ({ body: { rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() } }) },
  'GET /api/check-runs/by-code/:code': { req: () => ({ params: { code: ids.runCode! } }) },
  'GET /api/check-runs/:id': { req: () => ({ params: { id: ids.run! } }) },
  'GET /api/cars': {},
  'POST /api/cars': { ok: 201, req: () => ({ body: { name: 'Matrix car', chassisType: 'unibody' } }) },
  'GET /api/cars/:carId': {},
  'PATCH /api/cars/:carId': { req: () => ({ body: { raceNumber: '88' } }) },
  'POST /api/cars/:carId/archive': { req: () => ({ params: { carId: ids.shelvedCar! } }) },
  'POST /api/cars/:carId/unarchive': { req: () => ({ params: { carId: ids.shelvedCar! } }) },
  'DELETE /api/cars/:carId': { ok: 204, req: () => ({ params: { carId: ids.emptyCar! } }) },
  'POST /api/cars/:carId/build-sheets': { ok: 201, req: () => ({ body: { name: 'Matrix sheet', clubId: fx.clubId, rulesetVersionId: fx.versionId, classId: 'club-saloon' } }) },
  'GET /api/build-sheets/:sheetId': {},
  'PATCH /api/build-sheets/:sheetId': { req: () => ({ body: { name: 'Full cage 2027 (matrix)' } }) },
  'POST /api/build-sheets/:sheetId/archive': { req: () => ({ params: { sheetId: ids.shelvedSheet! } }) },
  'POST /api/build-sheets/:sheetId/unarchive': { req: () => ({ params: { sheetId: ids.shelvedSheet! } }) },
  'PUT /api/build-sheets/:sheetId/specification': {
    req: async () => {
      const sheet = (await who.owner.agent.get(`/api/build-sheets/${ids.sheetId}`).expect(200)).body;
      return { body: { baseRevision: sheet.buildSheet.currentRevision, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec() } };
    },
  },
  'GET /api/build-sheets/:sheetId/editions': {},
  // The owner is let through and finds no newer edition to move to (409); the readers get 403.
  'POST /api/build-sheets/:sheetId/move-edition': { ok: { owner: 409 }, req: () => ({ body: { baseRevision: 1, rulesetVersionId: fx.versionId } }) },
  'GET /api/build-sheets/:sheetId/side-by-side': {},
  // The demo club's second rulebook (the hillclimb schedule) beside the sheet's own.
  'POST /api/build-sheets/:sheetId/side-by-side': {
    req: async () => {
      const [hill]: { id: string }[] = await db.ds.query(
        `SELECT v.id FROM ruleset_versions v JOIN rulebooks r ON r.id = v.rulebook_id WHERE r.club_id = $1 AND r.slug = 'tarnwick-vale-mc-hillclimb-2027-metric' AND v.status = 'published'`,
        [fx.clubId],
      );
      return { body: { columns: [{ rulesetVersionId: hill!.id, classId: 'hill-saloon' }] } };
    },
  },
  'GET /api/build-sheets/:sheetId/revisions': {},
  'GET /api/build-sheets/:sheetId/revisions/:number': { req: () => ({ params: { number: '1' } }) },
  'GET /api/build-sheets/:sheetId/revisions/:from/diff/:to': { req: () => ({ params: { from: '1', to: '2' } }) },
  'POST /api/build-sheets/:sheetId/revisions/:number/restore': {
    req: async () => {
      const sheet = (await who.owner.agent.get(`/api/build-sheets/${ids.sheetId}`).expect(200)).body;
      return { params: { number: '2' }, body: { baseRevision: sheet.buildSheet.currentRevision } };
    },
  },
  'POST /api/build-sheets/:sheetId/check-runs': { ok: 201 },
  'GET /api/build-sheets/:sheetId/check-runs': {},
  'GET /api/check-runs/:checkRunId/report.pdf': { req: () => ({ params: { checkRunId: ids.run! } }) },
  'GET /api/build-sheets/:sheetId/photos': {},
  'POST /api/build-sheets/:sheetId/photos': { ok: 201, req: () => ({ photo: true }) },
  'GET /api/photos/:photoId/image': { req: () => ({ params: { photoId: ids.photo! } }) },
  'GET /api/photos/:photoId/thumbnail': { req: () => ({ params: { photoId: ids.photo! } }) },
  'PATCH /api/photos/:photoId': { req: () => ({ params: { photoId: ids.photo! }, body: { caption: 'Main hoop foot, left' } }) },
  'DELETE /api/photos/:photoId': { ok: 204, req: () => ({ params: { photoId: ids.sparePhoto! } }) },
  'GET /api/build-sheets/:sheetId/journal': {},
  'POST /api/build-sheets/:sheetId/journal': { ok: 201, req: () => ({ body: { stage: 'fully_welded', happenedOn: '2026-12-01' } }) },
  'PATCH /api/journal-entries/:entryId': { req: () => ({ body: { note: 'Fitted with the doors off.' } }) },
  'DELETE /api/journal-entries/:entryId': { ok: 204, req: () => ({ params: { entryId: ids.spareEntry! } }) },
  'POST /api/journal-entries/:entryId/photos': { ok: 201, req: () => ({ photo: true }) },
  'GET /api/journal-photos/:photoId/image': { req: () => ({ params: { photoId: ids.journalPhoto! } }) },
  'GET /api/journal-photos/:photoId/thumbnail': { req: () => ({ params: { photoId: ids.journalPhoto! } }) },
  'PATCH /api/journal-photos/:photoId': { req: () => ({ params: { photoId: ids.journalPhoto! }, body: { caption: 'Tacked, before the diagonal' } }) },
  'DELETE /api/journal-photos/:photoId': { ok: 204, req: () => ({ params: { photoId: ids.spareJournalPhoto! } }) },
  'POST /api/fabrication/cope': { req: () => ({ body: { branchOdMm: 38.1, runOdMm: 44.45, angleDeg: 90, offsetMm: 0 } }) },
  'POST /api/fabrication/cope.pdf': { req: () => ({ body: { branchOdMm: 38.1, runOdMm: 44.45, angleDeg: 90, offsetMm: 0, pageSize: 'A4' } }) },
  'POST /api/fabrication/leg-trim': { req: () => ({ body: { legs: [{ uncutMm: 1250, padHeightMm: 0 }, { uncutMm: 1250, padHeightMm: 12 }], leanDeg: 10, odMm: 44.45 } }) },
  'POST /api/fabrication/bend-schedule': { req: () => ({ body: { legsMm: [1238.95], bends: [], rotationsDeg: [], endLossMm: [12, 12], trimMm: [3, 3] } }) },
  'GET /api/fabrication/settings': {},
  'PUT /api/fabrication/settings': { req: () => ({ body: { dies: [], trimAllowanceMm: 3, stickLengthMm: 6000, kerfMm: 2 } }) },
  'GET /api/build-sheets/:sheetId/fabrication': {},
  'GET /api/build-sheets/:sheetId/buying-list.csv': {},
  'GET /api/build-sheets/:sheetId/tube-choice': {},
  // The lightest legal size of the first member that has one, on the sheet as it is now.
  'POST /api/build-sheets/:sheetId/tube-choice/apply': {
    req: async () => {
      const choice = (await who.owner.agent.get(`/api/build-sheets/${ids.sheetId}/tube-choice`).expect(200)).body as { revision: number; members: { memberId: string; lightest: { stockId: string } | null }[] };
      const m = choice.members.find((x) => x.lightest)!;
      return { body: { baseRevision: choice.revision, memberId: m.memberId, stockId: m.lightest!.stockId } };
    },
  },
  'PUT /api/build-sheets/:sheetId/fabrication/legs/:memberId': { req: () => ({ params: { memberId: 'mh' }, body: { legs: [{ uncutMm: 1250, padHeightMm: 0 }, { uncutMm: 1250, padHeightMm: 12 }], leanDeg: 10 } }) },
  'DELETE /api/build-sheets/:sheetId/fabrication/legs/:memberId': { ok: 204, req: () => ({ params: { memberId: 'mh' } }) },
  'POST /api/geometry/derive': { req: () => ({ body: { specification: saloonSpec() } }) },
  'GET /api/meta': {},
  'GET /api/openapi.json': {},
  'GET /api/clubs/:clubId/audit': {},
  'GET /api/jobs/:id': { req: () => ({ params: { id: ids.job! } }) },
  'POST /api/jobs/:id/retry': { ok: 202, req: () => ({ params: { id: ids.job! } }) },
  'POST /api/submissions': { ok: 201, req: () => ({ body: { checkRunId: ids.unsubmittedRun! } }) },
  'GET /api/submissions': {},
  'GET /api/submissions/:submissionId': {},
  // The review workflow decides after the policy: a builder cannot claim (403), the steward claims, and
  // the admin then finds it claimed already (409).
  'POST /api/submissions/:submissionId/actions': {
    ok: { owner: 403, steward: 200, admin: 409 },
    req: async () => {
      const seen = await current(who.owner, ids.submissionId!);
      return { body: { type: 'claim', expected: { state: seen.state, version: seen.version } } };
    },
  },
  'POST /api/submissions/:submissionId/resubmit': {
    ok: 201,
    req: async () => {
      const seen = await current(who.owner, ids.changesRequested!);
      return { params: { submissionId: ids.changesRequested! }, body: { checkRunId: ids.resubmitRun!, expected: { state: seen.state, version: seen.version } } };
    },
  },
  'POST /api/submissions/:submissionId/annotations': { ok: 201, req: async () => ({ body: { findingKey: await firstFindingKey(ids.submissionId!), text: 'Check the weld at this joint again.' } }) },
  'GET /api/submissions/:submissionId/report.pdf': { req: () => ({ params: { submissionId: ids.approved! } }) },
  'GET /api/clubs/:clubId/submissions': {},
  'GET /api/clubs/:clubId/review-mail': {},
  'PUT /api/clubs/:clubId/review-mail': { req: () => ({ body: { enabled: false } }) },
  'GET /api/cage-records/:recordId': {},
  // Revoked by the steward; the admin is let through and finds it revoked already.
  'POST /api/cage-records/:recordId/revoke': { ok: { steward: 200, admin: 409 }, req: () => ({ params: { recordId: ids.revocableRecord! }, body: { reason: 'The main hoop was cut and rewelded since.' } }) },
  'GET /api/clubs/:clubId/cage-records': { req: () => ({ query: { q: '47', status: 'valid' } }) },
  'GET /api/cage-records/:recordId/inspections': {},
  'POST /api/cage-records/:recordId/inspections': { ok: 201, req: () => ({ body: { sealNumber: 'TV-S-00417' } }) },
  'GET /api/clubs/:clubId/settings': {},
  'PATCH /api/clubs/:clubId/settings': { req: () => ({ body: { timeZone: 'Europe/London' } }) },
  'GET /api/clubs/:clubId/record-settings': {},
  'PATCH /api/clubs/:clubId/record-settings': { req: () => ({ body: { validityMonths: 12 } }) },
  'GET /api/clubs/:clubId/tube-stock': {},
  'POST /api/clubs/:clubId/tube-stock': { ok: 201, req: () => ({ body: { label: 'Odd size 42 × 2.6', odMm: 42, wallMm: 2.6, material: 'mild_steel', process: 'dom' } }) },
  'POST /api/clubs/:clubId/tube-stock/common': {},
  'PATCH /api/clubs/:clubId/tube-stock/:tubeId': { req: () => ({ params: { tubeId: ids.clubTube! }, body: { label: 'Main hoop size' } }) },
  'DELETE /api/clubs/:clubId/tube-stock/:tubeId': { ok: 204, req: () => ({ params: { tubeId: ids.spareClubTube! } }) },
  'GET /api/tube-stock/mine': {},
  'POST /api/tube-stock/mine': { ok: 201, req: () => ({ body: { label: 'Offcut 1.5 × 0.083', odMm: 38.1, wallMm: 2.108, material: 'mild_steel', process: 'dom' } }) },
  'PATCH /api/tube-stock/mine/:tubeId': { variant: 'own', req: () => ({ params: { tubeId: ids.ownTube! }, body: { label: 'Offcut, short' } }) },
  'DELETE /api/tube-stock/mine/:tubeId': { variant: 'own', ok: 204, req: () => ({ params: { tubeId: ids.spareOwnTube! } }) },
  'GET /api/verify/:code': { req: () => ({ params: { code: ids.runCode! } }) },
  'GET /api/dev/mailbox': {},
  'GET /api/dev/mailbox/:id': { req: () => ({ params: { id: ids.mail! } }) },
  'DELETE /api/dev/mailbox': { ok: 204 },
  // Every request its own car (a car holds one open offer), offered to the club's other builder.
  'POST /api/cars/:carId/transfer-offers': { ok: 201, req: async () => ({ params: { carId: await spareCar() }, body: { email: people.otherBuilder } }) },
  'GET /api/car-transfers': {},
  'POST /api/car-transfers/:transferId/accept': { req: async () => ({ params: { transferId: await offeredCar() } }) },
  'POST /api/car-transfers/:transferId/decline': { req: async () => ({ params: { transferId: await offeredCar() } }) },
  'POST /api/car-transfers/:transferId/withdraw': { req: async () => ({ params: { transferId: await offeredCar() } }) },
  'GET /api/clubs/:clubId/cars': {},
  'POST /api/clubs/:clubId/cars/:carId/transfer': { req: async () => ({ params: { carId: (await carWithSheet(who.owner, fx)).carId }, body: { toUserId: ids.otherBuilderId! } }) },
};

let spareCars = 0;
async function spareCar(): Promise<string> {
  const res = await who.owner.agent.post('/api/cars').set('X-CSRF-Token', who.owner.token).send({ name: `Car for sale ${++spareCars}`, chassisType: 'unibody' }).expect(201);
  return res.body.car.id as string;
}

/** A car of the owner's, offered to the club's other builder. */
async function offeredCar(): Promise<string> {
  const res = await who.owner.agent.post(`/api/cars/${await spareCar()}/transfer-offers`).set('X-CSRF-Token', who.owner.token).send({ email: people.otherBuilder }).expect(201);
  return res.body.transfer.id as string;
}

/** Parameters that name a thing by its UUID: the ones the "does not exist" column replaces. */
const idParam = /^(?:\w+Id|id)$/;

async function anonymous(): Promise<SignedIn> {
  const agent = agentFor(app);
  return { agent, token: await csrfToken(agent) };
}

async function session(actor: Actor): Promise<SignedIn> {
  return actor === 'anonymous' ? anonymous() : as(app, emails[actor]);
}

function fill(path: string, params: Record<string, string>): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => {
    const v = params[name] ?? ids[name];
    if (v === undefined) throw new Error(`no value for :${name} in ${path}`);
    return encodeURIComponent(v);
  });
}

async function call(caller: SignedIn, route: MountedRoute, req: Req) {
  const url = fill(route.path, req.params ?? {});
  let r = caller.agent[route.method](url).set('X-CSRF-Token', caller.token);
  if (req.query) r = r.query(req.query);
  if (req.photo) return r.field('captions', 'Matrix photo').attach('photos', await testJpeg(64, 48), 'matrix.jpg');
  return req.body === undefined ? r : r.send(req.body as object);
}

function expectedOk(f: Fixture, actor: Actor): number {
  if (typeof f.ok === 'number') return f.ok;
  return f.ok?.[actor] ?? 200;
}

const errorCode = { 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found' } as const;

beforeAll(async () => {
  app = makeTestApp(db.ds, {
    config: testConfig({ FAKE_SMTP: 'true' }),
    limits: {
      verify: { limit: 1_000_000 },
      signIn: { perEmailAndIp: 1_000_000, perIp: 1_000_000, delay: { freeFailures: 1_000_000, firstDelayMs: 0, maxDelayMs: 0 } },
      passwordChange: { limit: 1_000_000 },
      passwordReset: { perEmail: 1_000_000, perIp: 1_000_000 },
    },
    jobControl: { retry: async (id) => void jobRetries.push(id) },
  });
  fx = await garageFixture(db.ds);
  const fenmoor: { id: string }[] = await db.ds.query(`INSERT INTO clubs (slug, name) VALUES ('fenmoor-sprint', 'Fenmoor Sprint Club') RETURNING id`);
  const hash = await hashPassword(otherPassword);
  for (const [actor, roles] of [['otherSteward', '{steward}'], ['otherAdmin', '{admin}']] as const) {
    const u: { id: string }[] = await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, $2, $3) RETURNING id`, [emails[actor], actor === 'otherSteward' ? 'Noor Hale' : 'Piet Brand', hash]);
    await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, $3)`, [u[0]!.id, fenmoor[0]!.id, roles]);
  }
  who.anonymous = await anonymous();
  for (const a of actors) if (a !== 'anonymous') who[a] = await session(a);
  const { owner, admin, steward } = who;
  const send = (s: SignedIn, method: 'post' | 'put' | 'patch', url: string, body?: object) => s.agent[method](url).set('X-CSRF-Token', s.token).send(body);

  ids.clubId = fx.clubId;
  // The owner's car and sheet, with two revisions, photos, a journal with photos, and a saved check.
  const main = await carWithSheet(owner, fx);
  Object.assign(ids, { carId: main.carId, sheetId: main.sheetId });
  const sheet = (await owner.agent.get(`/api/build-sheets/${main.sheetId}`).expect(200)).body;
  await send(owner, 'put', `/api/build-sheets/${main.sheetId}/specification`, { baseRevision: sheet.buildSheet.currentRevision, rulesetVersionId: fx.versionId, classId: 'club-saloon', specification: saloonSpec({ doorBarWallMm: 2.5 }) }).expect(200);
  const photos = await owner.agent.post(`/api/build-sheets/${main.sheetId}/photos`).set('X-CSRF-Token', owner.token)
    .attach('photos', await testJpeg(64, 48), 'a.jpg').attach('photos', await testJpeg(64, 48), 'b.jpg').expect(201);
  ids.photo = photos.body.photos[0].id;
  ids.sparePhoto = photos.body.photos[1].id;
  ids.entryId = (await send(owner, 'post', `/api/build-sheets/${main.sheetId}/journal`, { stage: 'fitted', happenedOn: '2026-11-07' }).expect(201)).body.entry.id;
  ids.spareEntry = (await send(owner, 'post', `/api/build-sheets/${main.sheetId}/journal`, { stage: 'tacked', happenedOn: '2026-11-14' }).expect(201)).body.entry.id;
  const jp = await owner.agent.post(`/api/journal-entries/${ids.entryId}/photos`).set('X-CSRF-Token', owner.token)
    .attach('photos', await testJpeg(64, 48), 'c.jpg').attach('photos', await testJpeg(64, 48), 'd.jpg').expect(201);
  ids.journalPhoto = jp.body.photos[0].id;
  ids.spareJournalPhoto = jp.body.photos[1].id;
  ids.run = await savedRun(owner, main.sheetId);
  ids.runCode = (await owner.agent.get(`/api/check-runs/${ids.run}`).expect(200)).body.checkRun.verificationCode;

  ids.shelvedCar = (await send(owner, 'post', '/api/cars', { name: 'Shelved car', chassisType: 'unibody' }).expect(201)).body.car.id;
  ids.emptyCar = (await send(owner, 'post', '/api/cars', { name: 'Empty car', chassisType: 'unibody' }).expect(201)).body.car.id;
  ids.shelvedSheet = (await carWithSheet(owner, fx)).sheetId;

  // Submissions: one to act on and annotate, a sheet with a saved check not yet submitted, one the
  // steward sent back (with a new check to resubmit), and two approved ones with cage records.
  const submit = async (sheetId: string) => (await send(owner, 'post', '/api/submissions', { checkRunId: await savedRun(owner, sheetId) }).expect(201)).body.submission.id as string;
  const passing = async () => (await carWithSheet(owner, fx, passingSpec())).sheetId;
  ids.submissionId = await submit(await passing());
  ids.unsubmittedRun = await savedRun(owner, await passing());
  const sentBackSheet = await passing();
  ids.changesRequested = await submit(sentBackSheet);
  expect((await act(steward, ids.changesRequested, { type: 'claim' })).status).toBe(200);
  expect((await act(steward, ids.changesRequested, { type: 'request_changes', note: 'Add the gusset photos.' })).status).toBe(200);
  ids.resubmitRun = await savedRun(owner, sentBackSheet);
  const approve = async () => {
    const id = await submit(await passing());
    expect((await act(steward, id, { type: 'claim' })).status).toBe(200);
    const res = await act(steward, id, { type: 'approve' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    return { id, recordId: res.body.submission.record.id as string };
  };
  const approved = await approve();
  ids.approved = approved.id;
  ids.recordId = approved.recordId;
  ids.revocableRecord = (await approve()).recordId;

  // Rulebooks: the cage rulebook's open draft, a draft of the second rulebook to delete, and copies of
  // the second rulebook (one with no draft, one to retire).
  const books: { id: string; slug: string }[] = await db.ds.query(`SELECT id, slug FROM rulebooks WHERE club_id = $1 ORDER BY slug`, [fx.clubId]);
  const second = books.find((b) => b.id !== fx.rulebookId)!;
  const draft = (await send(admin, 'post', `/api/rulebooks/${fx.rulebookId}/drafts`).expect(201)).body.version;
  ids.draft = draft.id;
  ids.draftDocument = JSON.stringify(draft.document);
  ids.doomedDraft = (await send(admin, 'post', `/api/rulebooks/${second.id}/drafts`).expect(201)).body.version.id;
  const copyOf = async (suffix: string) => {
    const b: { id: string }[] = await db.ds.query(
      `INSERT INTO rulebooks (club_id, slug, title, publisher) SELECT club_id, slug || $2, title || ' (copy)', publisher FROM rulebooks WHERE id = $1 RETURNING id`,
      [second.id, suffix],
    );
    const v: { id: string }[] = await db.ds.query(
      `INSERT INTO ruleset_versions (rulebook_id, version_number, status, edition, effective_date, document, created_by, published_at, published_by)
       SELECT $2, 1, 'published', edition, effective_date, document, created_by, now(), published_by FROM ruleset_versions WHERE rulebook_id = $1 AND status = 'published' RETURNING id`,
      [second.id, b[0]!.id],
    );
    return { rulebookId: b[0]!.id, versionId: v[0]!.id };
  };
  ids.draftlessRulebook = (await copyOf('-a')).rulebookId;
  ids.retirable = (await copyOf('-b')).versionId;
  ids.rulebookId = fx.rulebookId;

  // Members, stock sizes, a job, a message in the development mailbox, an invitation.
  const member = async (email: string) => {
    const u: { id: string }[] = await db.ds.query(`INSERT INTO users (email, display_name, password_hash) VALUES ($1, 'Spare member', $2) RETURNING id`, [email, hash]);
    await db.ds.query(`INSERT INTO memberships (user_id, club_id, roles) VALUES ($1, $2, '{builder}')`, [u[0]!.id, fx.clubId]);
    return u[0]!.id;
  };
  ids.spareMember = await member('spare@tarnwick.example');
  ids.leavingMember = await member('leaving@tarnwick.example');
  ids.userId = ids.spareMember;
  const clubList = (await owner.agent.get(`/api/clubs/${fx.clubId}/tube-stock`).expect(200)).body.tubes;
  ids.clubTube = clubList[0].id;
  ids.spareClubTube = clubList[1].id;
  const tube = { odMm: 31.75, wallMm: 1.651, material: 'mild_steel', process: 'dom' };
  ids.ownTube = (await send(owner, 'post', '/api/tube-stock/mine', { label: 'Own 1.25', ...tube }).expect(201)).body.tube.id;
  ids.spareOwnTube = (await send(owner, 'post', '/api/tube-stock/mine', { label: 'Own spare', ...tube, odMm: 25.4 }).expect(201)).body.tube.id;
  ids.job = ((await db.ds.query(
    `INSERT INTO job_progress (job_id, queue, club_id, requested_by, state, error) SELECT gen_random_uuid(), 'republish', $1, id, 'failed', 'stopped in a test' FROM users WHERE email = $2 RETURNING job_id`,
    [fx.clubId, demo.admin],
  )) as { job_id: string }[])[0]!.job_id;
  ids.mail = await createMailboxService(db.ds).store({ to: 'robin@tarnwick.example', from: 'Cagewright <no-reply@cagewright.example>', subject: 'Matrix', text: 'Hello', html: null });
  ids.invitation = await invitationToken();
  ids.otherBuilderId = ((await db.ds.query(`SELECT id FROM users WHERE email = $1`, [people.otherBuilder])) as { id: string }[])[0]!.id;
}, 180_000);

describe('the access matrix', () => {
  it('has a rule, an expected row and a request for every mounted route', () => {
    const routes = mountedRoutes(app);
    expect(routes.length).toBeGreaterThan(90);
    const problems: string[] = [];
    for (const r of routes) {
      const key = routeKey(r);
      if (!r.spec) {
        problems.push(`${key}: mounted without route(), so it names no access rule`);
        continue;
      }
      if (!(r.spec.access in ACCESS_RULES)) problems.push(`${key}: unknown access rule ${r.spec.access}`);
      const f = FIXTURES[key];
      if (!f) problems.push(`${key}: no request in FIXTURES (its access rule is ${r.spec.access})`);
      else if (!EXPECT[f.variant ? `${r.spec.access}:${f.variant}` : r.spec.access]) problems.push(`${key}: no row in EXPECT for ${r.spec.access}${f.variant ? `:${f.variant}` : ''}`);
    }
    const mounted = new Set(routes.map(routeKey));
    for (const key of Object.keys(FIXTURES)) if (!mounted.has(key)) problems.push(`${key}: in FIXTURES but not mounted`);
    // Every rule of the policy is used by some route and has its row (a rule nothing uses is dead code).
    const used = new Set(routes.map((r) => r.spec?.access));
    for (const name of Object.keys(ACCESS_RULES)) {
      if (!used.has(name as never)) problems.push(`rule ${name} is used by no route`);
      if (!EXPECT[name]) problems.push(`rule ${name} has no row in EXPECT`);
    }
    expect(problems).toEqual([]);
  });

  it('answers every route × caller × ownership as its rule says', async () => {
    const routes = mountedRoutes(app).filter((r) => r.spec && FIXTURES[routeKey(r)]);
    const ordered = [...routes.filter((r) => !FIXTURES[routeKey(r)]!.last), ...routes.filter((r) => FIXTURES[routeKey(r)]!.last)];
    const wrong: string[] = [];
    let calls = 0;
    for (const r of ordered) {
      const key = routeKey(r);
      const f = FIXTURES[key]!;
      const cells = EXPECT[f.variant ? `${r.spec!.access}:${f.variant}` : r.spec!.access]!;
      // Refused callers first, so that an allowed change (a delete, a claim) cannot alter what they see.
      const order = [...actors.filter((a) => cells[a] !== 'ok'), ...actors.filter((a) => cells[a] === 'ok')];
      for (const actor of order) {
        const caller = f.fresh ? await session(actor) : who[actor];
        const res = await call(caller, r, await (f.req?.(actor) ?? {}));
        calls++;
        const cell = cells[actor];
        const want = cell === 'ok' ? expectedOk(f, actor) : cell;
        const body = res.body as { error?: { code?: string } } | undefined;
        if (res.status !== want) wrong.push(`${key} as ${actor}: ${res.status} (${JSON.stringify(res.body).slice(0, 160)}), expected ${want}`);
        else if (cell !== 'ok' && body?.error?.code !== errorCode[cell]) wrong.push(`${key} as ${actor}: code ${body?.error?.code}, expected ${errorCode[cell]}`);
      }
      // The same route for a thing that does not exist: the same answer as for a thing one may not see.
      const names = [...r.path.matchAll(/:(\w+)/g)].map((m) => m[1]!).filter((n) => idParam.test(n));
      if (names.length === 0 || f.fresh || f.last) continue;
      for (const actor of actors) {
        const req = await (f.req?.(actor) ?? {});
        const params = { ...(req.params ?? {}), ...Object.fromEntries(names.map((n) => [n, '00000000-0000-4000-8000-00000000abcd'])) };
        const res = await call(who[actor], r, { ...req, params });
        calls++;
        const before = r.spec!.access === 'anyClub.admin' || r.spec!.access === 'self.builder' ? cells[actor] : null;
        const want = actor === 'anonymous' ? 401 : before === 403 ? 403 : 404;
        if (res.status !== want) wrong.push(`${key} (unknown id) as ${actor}: ${res.status}, expected ${want}`);
      }
    }
    expect(wrong).toEqual([]);
    expect(calls).toBeGreaterThan(1000);
    expect(jobRetries).toEqual([ids.job]);
  }, 600_000);
});

// The policy must not lean on the order of the guards: a signed-out call to a route of every rule is a 401
// with the one error shape, even without a CSRF token on a read.
describe('signed out', () => {
  it('gets 401 unauthenticated from a read of every rule but public', async () => {
    const reads = mountedRoutes(app).filter((r) => r.method === 'get' && r.spec && r.spec.access !== 'public');
    for (const r of reads) {
      const f = FIXTURES[routeKey(r)]!;
      const res = await request(app).get(fill(r.path, (await (f.req?.('anonymous') ?? {})).params ?? {}));
      expect([routeKey(r), res.status, res.body.error?.code]).toEqual([routeKey(r), 401, 'unauthenticated']);
    }
  });
});


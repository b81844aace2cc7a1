// The access policy's rules as plain facts in, verdicts out (backend/src/domain/access-policy.ts). The
// API-level matrix (tests/api/access-matrix.test.ts) checks that every route asks the right rule; this
// checks the rules themselves on the edge cases the API cannot easily reach (an owner who left the club,
// a member with every role, a job of no club).
import { describe, expect, test } from 'vitest';
import { accessRuleNames, allows, decide, refusalsOf, type AccessFacts, type AccessRuleName } from '../../../backend/src/domain/access-policy';

const me = 'user-1';
const other = 'user-2';

type Case = [AccessRuleName, string, AccessFacts, true | 401 | 403 | 404];

const cases: Case[] = [
  ['public', 'signed out', { actorId: null }, true],
  ['signedIn', 'signed out', { actorId: null }, 401],
  ['signedIn', 'signed in, no club at all', { actorId: me }, true],
  ['self.builder', 'a builder somewhere', { actorId: me, rolesAnywhere: ['builder'] }, true],
  ['self.builder', 'only a steward and an admin', { actorId: me, rolesAnywhere: ['steward', 'admin'] }, 403],
  ['club.member', 'not a member', { actorId: me, roles: null }, 404],
  ['club.member', 'a builder', { actorId: me, roles: ['builder'] }, true],
  ['club.reviewer', 'a builder', { actorId: me, roles: ['builder'] }, 403],
  ['club.reviewer', 'an admin', { actorId: me, roles: ['admin'] }, true],
  ['club.steward', 'an admin who is not a steward', { actorId: me, roles: ['admin'] }, 403],
  ['club.admin', 'a steward', { actorId: me, roles: ['steward'] }, 403],
  ['club.admin', 'signed out', { actorId: null, roles: ['admin'] }, 401],
  ['anyClub.admin', 'an admin of some club', { actorId: me, rolesAnywhere: ['admin'] }, true],
  ['anyClub.admin', 'no admin role anywhere', { actorId: me, rolesAnywhere: ['builder', 'steward'] }, 403],
  ['car.owner', 'the owner', { actorId: me, ownerId: me }, true],
  ['car.owner', 'an admin of the club, not the owner', { actorId: me, ownerId: other, roles: ['admin'] }, 404],
  ['car.addSheet', 'the owner, a builder of the club', { actorId: me, ownerId: me, roles: ['builder'] }, true],
  ['car.addSheet', 'the owner, not a member of the club', { actorId: me, ownerId: me, roles: null }, 404],
  ['car.addSheet', 'the owner, only a steward of the club', { actorId: me, ownerId: me, roles: ['steward'] }, 403],
  ['car.addSheet', 'someone else’s car', { actorId: me, ownerId: other, roles: ['builder'] }, 404],
  ['sheet.read', 'the owner who has left the club', { actorId: me, ownerId: me, roles: null }, true],
  ['sheet.read', 'another builder of the club', { actorId: me, ownerId: other, roles: ['builder'] }, 404],
  ['sheet.read', 'a steward of the club', { actorId: me, ownerId: other, roles: ['steward'] }, true],
  ['sheet.edit', 'a steward of the club', { actorId: me, ownerId: other, roles: ['steward'] }, 403],
  ['sheet.edit', 'a stranger', { actorId: me, ownerId: other, roles: null }, 404],
  ['sheet.edit', 'a thing of no owner', { actorId: me, ownerId: null, roles: null }, 404],
  ['checkRun.read', 'whoever saved it', { actorId: me, ownerId: me, roles: null }, true],
  ['checkRun.read', 'an admin of the club', { actorId: me, ownerId: other, roles: ['admin'] }, true],
  ['version.read', 'a builder, a published version', { actorId: me, roles: ['builder'], draft: false }, true],
  ['version.read', 'a builder, a draft', { actorId: me, roles: ['builder'], draft: true }, 404],
  ['version.read', 'an admin, a draft', { actorId: me, roles: ['admin'], draft: true }, true],
  ['version.admin', 'a steward, a published version', { actorId: me, roles: ['steward'], draft: false }, 403],
  ['version.admin', 'a steward, a draft (not known to exist)', { actorId: me, roles: ['steward'], draft: true }, 404],
  ['rulebook.admin', 'a builder', { actorId: me, roles: ['builder'] }, 403],
  ['submission.create', 'the sheet’s owner', { actorId: me, ownerId: me, roles: ['builder'] }, true],
  ['submission.create', 'a steward who reads the sheet', { actorId: me, ownerId: other, roles: ['steward'] }, 403],
  ['submission.read', 'the builder who submitted it', { actorId: me, ownerId: me, roles: [] }, true],
  ['submission.act', 'another builder', { actorId: me, ownerId: other, roles: ['builder'] }, 404],
  ['submission.resubmit', 'an admin of the club', { actorId: me, ownerId: other, roles: ['admin'] }, 403],
  ['submission.annotate', 'a steward', { actorId: me, ownerId: other, roles: ['steward'] }, true],
  ['submission.annotate', 'a steward, on their own submission', { actorId: me, ownerId: me, roles: ['steward', 'builder'] }, 403],
  ['submission.annotate', 'an admin who is not a steward', { actorId: me, ownerId: other, roles: ['admin'] }, 403],
  ['submission.annotate', 'the builder', { actorId: me, ownerId: me, roles: ['builder'] }, 403],
  ['record.read', 'the car’s owner', { actorId: me, ownerId: me, roles: null }, true],
  ['record.revoke', 'the car’s owner', { actorId: me, ownerId: me, roles: ['builder'] }, 403],
  ['record.revoke', 'a steward of another club', { actorId: me, ownerId: other, roles: null }, 404],
  ['record.inspect', 'a steward of the club', { actorId: me, ownerId: other, roles: ['steward'] }, true],
  ['record.inspect', 'an admin of the club', { actorId: me, ownerId: other, roles: ['admin'] }, true],
  ['record.inspect', 'a steward, on their own car', { actorId: me, ownerId: me, roles: ['steward', 'builder'] }, 403],
  ['record.inspect', 'the car’s owner', { actorId: me, ownerId: me, roles: ['builder'] }, 403],
  ['record.inspect', 'another builder of the club', { actorId: me, ownerId: other, roles: ['builder'] }, 404],
  ['record.inspect', 'a steward of another club', { actorId: me, ownerId: other, roles: null }, 404],
  ['job.admin', 'a job of no club', { actorId: me, roles: null }, 404],
  ['job.admin', 'an admin of its club', { actorId: me, roles: ['admin', 'steward'] }, true],
];

describe('the access policy', () => {
  test.each(cases)('%s: %s', (rule, _who, facts, expected) => {
    const verdict = decide(rule, facts);
    expect(verdict).toEqual(expected === true ? { allowed: true } : { allowed: false, status: expected });
    expect(allows(rule, facts)).toBe(expected === true);
  });

  test('every rule but public refuses the signed-out with 401, whatever else is true', () => {
    for (const rule of accessRuleNames.filter((n) => n !== 'public')) {
      expect([rule, decide(rule, { actorId: null, ownerId: null, roles: ['admin', 'steward', 'builder'], rolesAnywhere: ['admin', 'builder'] })]).toEqual([rule, { allowed: false, status: 401 }]);
    }
  });

  test.each<[AccessRuleName, number[]]>([
    ['public', []],
    ['signedIn', [401]],
    ['club.admin', [401, 403, 404]],
    ['sheet.read', [401, 404]],
    ['anyClub.admin', [401, 403]],
  ])('%s can refuse with %j', (rule, statuses) => {
    expect(refusalsOf(rule)).toEqual(statuses);
  });
});

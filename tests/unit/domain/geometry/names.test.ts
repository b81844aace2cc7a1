// The name a person reads for a member: the builder's label, else the kind's words, numbered only
// when the cage has more than one of that kind; never the internal id. memberNames (one pass, what
// the drawing calls per keystroke) agrees with memberName for every member.
import { describe, expect, test } from 'vitest';
import { memberName, memberNames, type NamedMember } from '@backend/domain/geometry/names';

const cage: NamedMember[] = [
  { id: 'mh', kind: 'main_hoop' },
  { id: 'rb-1', kind: 'rear_brace', label: 'backstay left' },
  { id: 'rb-2', kind: 'rear_brace' },
  { id: 'db-1', kind: 'door_bar' },
  { id: 'db-2', kind: 'door_bar', label: '  ' },
  { id: 'db-3', kind: 'door_bar' },
];

describe('member names', () => {
  test.each([
    [0, 'main hoop'],
    [1, 'backstay left'],
    [2, 'rear brace (backstay) 2'],
    [3, 'door bar 1'],
    [4, 'door bar 2'], // a blank label is no label
    [5, 'door bar 3'],
  ])('member %i is "%s"', (i, name) => expect(memberName(cage, i)).toBe(name));
  test('memberNames agrees with memberName for every member', () => {
    expect(memberNames(cage)).toEqual(cage.map((_, i) => memberName(cage, i)));
  });
  test('no name is an id', () => {
    for (const name of memberNames(cage)) expect(cage.map((m) => m.id)).not.toContain(name);
  });
});

// The build sheet's new inputs as the draft carries them to the wire: sides, driver's side, the
// included brace angle, the two fixings and the cage's dates and certificate; bad ones refused at
// the path of their input.
import { describe, expect, test } from 'vitest';
import { checkDraft, draftFromSpecification, emptyDraft } from '@/composables/useBuildSheetDraft';

const draft = () => {
  const d = emptyDraft('hill-saloon');
  d.vehicle.driverSide = 'right';
  d.members.push({ id: 'rb1', kind: 'rear_brace', odMm: 45, wallMm: 2.5, side: 'left' });
  d.geometry.rearBraceIncludedAngleDeg = 38;
  d.plates.push({ id: 'p1', location: 'main_hoop_foot', plateFixing: 'bolted', footFixing: 'welded' });
  d.cage = { approvedOn: '1998-05-14', certificate: { issuer: 'Example Cage Works', number: 'ECW-0457' } };
  return d;
};

describe('checkDraft with the issue 9 inputs', () => {
  test('every new field reaches the specification unchanged, and reads back into a draft', () => {
    const r = checkDraft(draft());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.specification.vehicle.driverSide).toBe('right');
    expect(r.specification.members[0]!.side).toBe('left');
    expect(r.specification.geometry?.rearBraceIncludedAngleDeg).toBe(38);
    expect(r.specification.plates?.[0]).toMatchObject({ plateFixing: 'bolted', footFixing: 'welded' });
    expect(r.specification.cage).toEqual({ approvedOn: '1998-05-14', certificate: { issuer: 'Example Cage Works', number: 'ECW-0457' } });
    expect(draftFromSpecification(r.specification).cage).toEqual(r.specification.cage);
  });
  test('an issuer without a number asks for the number at its input', () => {
    const d = draft();
    d.cage.certificate = { issuer: 'Example Cage Works' };
    const r = checkDraft(d);
    expect(r.ok).toBe(false);
    expect(r.problems).toEqual([{ path: 'cage.certificate.number', message: 'Enter the certificate number, or clear the issuer.' }]);
  });
  test('a future approval date and a side on a main hoop are refused at their inputs', () => {
    const d = draft();
    d.cage.approvedOn = '2999-01-01';
    d.members.push({ id: 'mh', kind: 'main_hoop', odMm: 45, wallMm: 2.5, side: 'left' });
    const r = checkDraft(d);
    expect(r.ok).toBe(false);
    expect(r.problems.map((p) => p.path).sort()).toEqual(['cage.approvedOn', 'members.1.side']);
  });
  test('an empty cage section sends nothing', () => {
    const d = draft();
    d.cage = {};
    const r = checkDraft(d);
    expect(r.ok && r.specification.cage).toBe(undefined);
  });
});

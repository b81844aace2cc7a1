// diffSpecifications: what changed between two revisions, as a table of before/after specifications
// and the changes a person should read. Unit texts come from formatQuantity (F-UNIT-1: 1 in = 25.4 mm
// exactly, so 44.45 mm shows as 1.750 in).
import { describe, expect, it } from 'vitest';
import type { Specification } from '@backend/contracts/specification';
import { diffSpecifications, dimensionOfField, fieldLabel, leavesOf } from '@backend/services/garage/revision-diff';
import { tubeDataFor } from '@backend/services/garage/tube-data';

const base: Specification = {
  vehicle: { classId: 'sedan', weightWithDriverKg: 1200 },
  members: [
    { id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 2.41, material: 'mild_steel', lengthMm: 3000 },
    { id: 'rb-l', kind: 'rear_brace', odMm: 38.1, wallMm: 2.41, bends: [{ clrMm: 150 }] },
  ],
  geometry: { hoopAboveHelmetMm: 60 },
  plates: [{ id: 'p1', location: 'main_hoop_foot', thicknessMm: 3 }],
  inspectionHoles: [{ memberId: 'mh', diameterMm: 4.8 }],
};

function edit(change: (s: Specification) => void): Specification {
  const copy = structuredClone(base);
  change(copy);
  return copy;
}

describe('diffSpecifications', () => {
  it('finds nothing between equal revisions', () => {
    expect(diffSpecifications(base, structuredClone(base), 'metric')).toEqual([]);
  });

  it.each<[string, (s: Specification) => void, 'metric' | 'imperial', Partial<ReturnType<typeof diffSpecifications>[number]>[]]>([
    ['a thicker main hoop wall', (s) => { s.members[0]!.wallMm = 3; }, 'metric',
      [{ kind: 'changed', section: 'members', subjectId: 'mh', field: 'wallMm', fieldLabel: 'wall', before: 2.41, after: 3, dimension: 'length', text: 'main hoop "mh": wall 2.41 mm → 3.00 mm' }]],
    ['the same change in inches', (s) => { s.members[0]!.odMm = 50.8; }, 'imperial',
      [{ field: 'odMm', before: 44.45, after: 50.8, text: 'main hoop "mh": OD 1.750 in → 2.000 in' }]],
    ['an added member', (s) => { s.members.push({ id: 'hb', kind: 'harness_bar', odMm: 38.1, wallMm: 2.41 }); }, 'metric',
      [{ kind: 'added', subjectId: 'hb', field: null, before: null, after: null, text: 'Added harness bar "hb" (38.1 × 2.41 mm)' }]],
    ['a removed member', (s) => { s.members.splice(1, 1); }, 'metric',
      [{ kind: 'removed', subjectId: 'rb-l', text: 'Removed rear brace (backstay) "rb-l"' }]],
    ['a bend radius inside a member', (s) => { s.members[1]!.bends = [{ clrMm: 120 }]; }, 'metric',
      [{ field: 'bends.0.clrMm', fieldLabel: 'bend 1 centreline radius', before: 150, after: 120, dimension: 'length' }]],
    ['a material given for the first time', (s) => { s.members[1]!.material = 'chromoly_4130'; }, 'metric',
      [{ field: 'material', before: null, after: 'chromoly_4130', dimension: null, text: 'rear brace (backstay) "rb-l": material set to chromoly 4130' }]],
    ['a length cleared', (s) => { delete s.members[0]!.lengthMm; }, 'metric',
      [{ field: 'lengthMm', before: 3000, after: null, text: 'main hoop "mh": length cleared (was 3000 mm)' }]],
    ['the vehicle weight in pounds', (s) => { s.vehicle.weightWithDriverKg = 1250; }, 'imperial',
      // 1200 kg / 0.45359237 = 2645.5 lb; 1250 kg = 2755.8 lb (F-UNIT-1)
      [{ section: 'vehicle', field: 'weightWithDriverKg', dimension: 'mass', text: 'vehicle: weight with driver 2646 lb → 2756 lb' }]],
    ['a geometry measurement', (s) => { s.geometry = { hoopAboveHelmetMm: 45 }; }, 'metric',
      [{ section: 'geometry', field: 'hoopAboveHelmetMm', fieldLabel: 'main hoop above the helmet', before: 60, after: 45 }]],
    ['a plate thickness and a new plate', (s) => { s.plates![0]!.thicknessMm = 4; s.plates!.push({ id: 'p2', location: 'front_hoop_foot' }); }, 'metric',
      [{ section: 'plates', subjectId: 'p1', field: 'thicknessMm', text: 'plate "p1" (main hoop foot): thickness 3.00 mm → 4.00 mm' },
        { kind: 'added', section: 'plates', subjectId: 'p2' }]],
    ['an inspection hole removed', (s) => { s.inspectionHoles = []; }, 'metric',
      [{ kind: 'removed', section: 'inspectionHoles', subjectId: '1', text: 'Removed inspection hole 1' }]],
    ['padding and welding given', (s) => { s.padding = { nearHelmet: true }; s.welding = { process: 'tig' }; }, 'metric',
      [{ section: 'padding', field: 'nearHelmet', before: null, after: true, text: 'padding: near the helmet set to yes' },
        { section: 'welding', field: 'process', after: 'tig', text: 'welding: process set to tig' }]],
  ])('reports %s', (_label, change, units, expected) => {
    const changes = diffSpecifications(base, edit(change), units);
    expect(changes).toHaveLength(expected.length);
    expected.forEach((e, i) => expect(changes[i]).toMatchObject(e));
  });

  it('quotes free text but not vocabulary words', () => {
    const changes = diffSpecifications(base, edit((s) => { s.members[0]!.grade = 'DOM 1020'; s.members[0]!.kind = 'halo_hoop'; }), 'metric');
    expect(changes.map((c) => c.text)).toEqual(['halo hoop "mh": kind main hoop → halo hoop', 'halo hoop "mh": grade set to "DOM 1020"']);
  });

  it('treats a renamed member as one removed and one added', () => {
    const changes = diffSpecifications(base, edit((s) => { s.members[0]!.id = 'main'; }), 'metric');
    expect(changes.map((c) => [c.kind, c.subjectId])).toEqual([['removed', 'mh'], ['added', 'main']]);
  });
});

describe('diff helpers', () => {
  it.each([
    ['wallMm', 'length'], ['bends.0.clrMm', 'length'], ['areaMm2', 'area'], ['weightWithDriverKg', 'mass'],
    ['rearBraceAngleFromVerticalDeg', 'angle'], ['yieldMpa', 'stress'], ['boltCount', 'count'], ['material', null], ['sidesMm.1', 'length'],
  ])('dimension of %s is %s', (path, dim) => expect(dimensionOfField(path)).toBe(dim));

  it.each([
    ['wallReadings.1.wallMm', 'wall reading 2 wall'], ['sidesMm.0', 'side 1'], ['joints.0.kind', 'joint 1 kind'], ['someNewFieldMm', 'some new field'],
  ])('label of %s is %s', (path, label) => expect(fieldLabel(path)).toBe(label));

  it('flattens nested values to dotted leaves and skips undefined', () => {
    expect([...leavesOf({ a: 1, b: { c: [true, 'x'] }, d: undefined })]).toEqual([['a', 1], ['b.c.0', true], ['b.c.1', 'x']]);
  });
});

describe('tubeDataFor', () => {
  it('groups a cut list by material and size, largest first, with lengths and masses', () => {
    const spec = edit((s) => {
      s.members.push({ id: 'rb-r', kind: 'rear_brace', odMm: 38.1, wallMm: 2.41, lengthMm: 1000 });
      s.members[1]!.lengthMm = 1200;
    });
    const data = tubeDataFor(spec);
    expect(data.cutList.map((r) => [r.material, r.odMm, r.memberIds, r.totalLengthMm])).toEqual([
      ['mild_steel', 44.45, ['mh'], 3000],
      ['unspecified', 38.1, ['rb-l', 'rb-r'], 2200],
    ]);
    // F-ENG-1 hollow circle A = π/4 (D² − d²); F-ENG-6 steel 7.85 g/cm³: 38.1 × 2.41 → 270.2 mm² → 2.121 kg/m
    const braces = data.cutList[1]!;
    expect(braces.massPerMetreKg).toBeCloseTo((Math.PI / 4) * (38.1 ** 2 - (38.1 - 4.82) ** 2) * 7.85 / 1000, 9);
    expect(braces.massKg).toBeCloseTo(braces.massPerMetreKg * 2.2, 9);
    expect(data.massComplete).toBe(true);
    expect(data.estimatedTubeMassKg).toBeCloseTo(data.cutList[0]!.massKg + braces.massKg, 9);
  });

  it('keeps members without a length out of the totals and says so', () => {
    const data = tubeDataFor(base);
    expect(data.massComplete).toBe(false);
    expect(data.membersWithoutLength).toEqual(['rb-l']);
    expect(data.cutList[1]!.membersWithoutLength).toEqual(['rb-l']);
    expect(data.cutList[1]!.totalLengthMm).toBe(0);
  });
});

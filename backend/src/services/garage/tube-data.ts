// Tube data a builder wants at hand beside the specification: per-member section properties and
// mass per length (from the domain), and the cut list, i.e. how much of each tube size to buy and
// what it weighs. Pure: the same specification always gives the same numbers.
import type { Specification } from '../../contracts/specification';
import type { CutListRowWire, TubeDataWire } from '../../contracts/garage';
import { memberTubeData } from '../../domain/facts';
import { memberNames } from '../../domain/geometry/names';
import { deriveCageGeometry } from '../../domain/geometry/derive';
import { modelLengths } from '../../domain/model-facts';

export function tubeDataFor(spec: Specification): TubeDataWire {
  // With a model, a member's developed centreline length is its length.
  const lengths = modelLengths(spec, spec.model ? deriveCageGeometry(spec) : null);
  const names = memberNames(spec.members);
  const members = spec.members.map((m, i) => memberTubeData(m, i, lengths.get(m.id), names[i]));
  const rows = new Map<string, CutListRowWire>();
  spec.members.forEach((m, i) => {
    const tube = members[i]!;
    const material = m.material ?? 'unspecified';
    const key = `${material}|${m.odMm}|${m.wallMm}`;
    let row = rows.get(key);
    if (!row) {
      row = { odMm: m.odMm, wallMm: m.wallMm, material, memberIds: [], memberNames: [], totalLengthMm: 0, massKg: 0, massPerMetreKg: tube.massPerMetreKg, membersWithoutLength: [], namesWithoutLength: [] };
      rows.set(key, row);
    }
    row.memberIds.push(m.id);
    row.memberNames.push(names[i]!);
    if (tube.lengthMm === null || tube.massKg === null) {
      row.membersWithoutLength.push(m.id);
      row.namesWithoutLength.push(names[i]!);
    }
    else {
      row.totalLengthMm += tube.lengthMm;
      row.massKg += tube.massKg;
    }
  });
  // Largest stock first, as a cut list is usually read: the hoops' size, then the braces'.
  const cutList = [...rows.values()].sort((a, b) => b.odMm - a.odMm || b.wallMm - a.wallMm || a.material.localeCompare(b.material));
  const without = members.filter((t) => t.lengthMm === null);
  const membersWithoutLength = without.map((t) => t.memberId);
  return {
    members,
    cutList,
    estimatedTubeMassKg: members.reduce((sum, t) => sum + (t.massKg ?? 0), 0),
    massComplete: membersWithoutLength.length === 0,
    membersWithoutLength,
    namesWithoutLength: without.map((t) => t.name ?? t.memberId),
  };
}

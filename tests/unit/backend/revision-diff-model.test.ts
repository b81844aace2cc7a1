// Revision diff of the cage model: node moves and path changes in words and in the builder's units,
// members by the builder's name (never an internal id).
import { describe, expect, it } from 'vitest';
import { diffSpecifications } from '@backend/services/garage/revision-diff';
import type { Specification } from '@backend/contracts/specification';
import { parseSpecification } from '@backend/contracts/specification';
import { cageSpec } from '../../fixtures/cage-model';

const spec = (): Specification => {
  const r = parseSpecification(cageSpec());
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  return r.value;
};
const texts = (a: Specification, b: Specification, system: 'metric' | 'imperial' = 'metric') => diffSpecifications(a, b, system).map((c) => c.text);

describe('model changes in the revision diff', () => {
  it('a node moved up says how far, in the builder’s units', () => {
    const a = spec();
    const b = structuredClone(a);
    b.model!.nodes.find((n) => n.id === 'tl')!.zMm += 12;
    expect(texts(a, b)).toEqual(["node 'hoop top left' moved 12 mm up"]);
    // 25.4 mm is exactly 1 in (F-UNIT-1).
    b.model!.nodes.find((n) => n.id === 'tl')!.zMm = a.model!.nodes.find((n) => n.id === 'tl')!.zMm + 25.4;
    b.model!.nodes.find((n) => n.id === 'tl')!.xMm -= 50.8;
    expect(texts(a, b, 'imperial')).toEqual(["node 'hoop top left' moved 1.000 in up and 2.000 in back"]);
  });
  it('nodes added and removed, and a path that runs elsewhere', () => {
    const a = spec();
    const b = structuredClone(a);
    b.model!.nodes.push({ id: 'bl2', label: 'backstay foot left, further back', role: 'foot', xMm: -1000, yMm: 550, zMm: 300 });
    b.members[1]!.path = [{ nodeId: 'jl' }, { nodeId: 'bl2' }];
    expect(texts(a, b)).toEqual([
      "Added node 'backstay foot left, further back' at (-1000, 550, 300) mm",
      "backstay left: path now runs 'backstay junction left' → 'backstay foot left, further back' (was 'backstay junction left' → 'backstay foot left')",
    ]);
  });
  it('a bend radius change names the node; a member is named by its label', () => {
    const a = spec();
    const b = structuredClone(a);
    b.members[0]!.path![3]!.clrMm = 140;
    b.members[0]!.odMm = 50;
    expect(texts(a, b)).toEqual(['main hoop: OD 45.0 mm → 50.0 mm', "main hoop: bend at 'hoop top left' radius 150 mm → 140 mm"]);
  });
});

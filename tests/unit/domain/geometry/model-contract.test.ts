// The cage model on the wire: every bad input refused at its field path with a clear message.
import { describe, expect, test } from 'vitest';
import { parseSpecification } from '@backend/contracts/specification';
import { cageSpec } from '../../../fixtures/cage-model';

type Spec = ReturnType<typeof cageSpec>;
const problems = (mutate: (s: Spec) => void) => {
  const s = structuredClone(cageSpec());
  mutate(s);
  const r = parseSpecification(s);
  return r.ok ? [] : r.problems;
};

describe('specification.model', () => {
  test('the fixture cage is valid, and a sheet without a model stays valid', () => {
    expect(problems(() => {})).toEqual([]);
    expect(parseSpecification({ vehicle: { classId: 'x' }, members: [{ id: 'a', kind: 'main_hoop', odMm: 45, wallMm: 2.5 }] }).ok).toBe(true);
  });
  test('a path naming a node that does not exist', () => {
    expect(problems((s) => { s.members[1].path[1].nodeId = 'nowhere'; })).toEqual([{ path: 'members.1.path.1.nodeId', message: 'No node has the id "nowhere".' }]);
  });
  test('a path of fewer than two nodes', () => {
    expect(problems((s) => { s.members[1].path = [{ nodeId: 'jl' }]; })).toEqual([{ path: 'members.1.path', message: 'A path needs at least two nodes' }]);
  });
  test('a zero-length segment', () => {
    expect(problems((s) => { s.model.nodes[8] = { ...s.model.nodes[8], xMm: 0, yMm: 600, zMm: 1000 }; })).toEqual([
      { path: 'members.1.path.1.nodeId', message: 'This node is at the same place as the one before it in the path (a zero-length segment).' },
    ]);
  });
  test('a bend whose radius is too large for its straights (tangents overlap)', () => {
    // Corner setback = CLR for 90°; the leg straight from the junction to the corner is 150 mm.
    const p = problems((s) => { s.members[0].path[3].clrMm = 200; });
    expect(p).toHaveLength(1);
    expect(p[0].path).toBe('members.0.path.3.clrMm');
    expect(p[0].message).toMatch(/too large for its straights.*tangents overlap/);
  });
  test('a radius on an end node, on a straight-through node, and under half the OD', () => {
    expect(problems((s) => { s.members[1].path[0] = { nodeId: 'jl', clrMm: 100 } as never; })[0].path).toBe('members.1.path.0.clrMm');
    expect(problems((s) => { (s.members[0].path[1] as { clrMm?: number }).clrMm = 100; })).toEqual([
      { path: 'members.0.path.1.clrMm', message: 'The path runs straight through this node, so it cannot carry a bend radius.' },
    ]);
    expect(problems((s) => { s.members[0].path[3].clrMm = 20; })).toEqual([{ path: 'members.0.path.3.clrMm', message: 'A centreline radius under half the OD is not a bend.' }]);
  });
  test('a coordinate more than 5 m from the origin: check the units', () => {
    const p = problems((s) => { s.model.nodes[0].zMm = 5001; });
    expect(p).toEqual([{ path: 'model.nodes.0.zMm', message: 'More than 5 m from the origin: check the units (the model is in millimetres)' }]);
  });
  test('a node id used twice', () => {
    expect(problems((s) => { s.model.nodes[1].id = 'fl'; })).toContainEqual({ path: 'model.nodes.1.id', message: 'Node id "fl" is already used by another node.' });
  });
  test('more than 200 nodes', () => {
    const p = problems((s) => {
      for (let i = 0; i < 191; i++) s.model.nodes.push({ id: `n${i}`, role: 'end', xMm: i, yMm: 0, zMm: 0 } as never);
    });
    expect(p).toEqual([{ path: 'model.nodes', message: 'At most 200 nodes' }]);
  });
  test('a member over the existing limits is still refused with a model', () => {
    const p = problems((s) => {
      for (let i = 0; i < 56; i++) s.members.push({ ...s.members[3], id: `x${i}` });
    });
    expect(p).toContainEqual({ path: 'members', message: 'At most 60 members' });
  });
  test('a path without a model, and the new vehicle fields refused when out of range', () => {
    expect(problems((s) => { delete (s as { model?: unknown }).model; })).toContainEqual({ path: 'members.0.path', message: 'A path needs the model’s nodes; add the nodes first.' });
    expect(problems((s) => { s.vehicle.helmet.radiusMm = 0; })[0].path).toBe('vehicle.helmet.radiusMm');
    expect(problems((s) => { (s.vehicle as { driverSide: string }).driverSide = 'middle'; })[0].path).toBe('vehicle.driverSide');
  });
});

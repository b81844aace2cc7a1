// A small hand-built cage in the model frame (x forward, y left, z up, mm) for geometry tests: a
// main hoop with vertical legs and 90° top corners, two straight backstays from junctions on the
// legs, a harness bar and a diagonal in the main hoop. Invented dimensions.
import type { CageNode, PathEntry } from '@backend/domain/geometry/index';
import type { MemberKind } from '@backend/domain/vocabulary';

export interface FixtureSpec {
  vehicle: { classId: string; driverSide?: 'left' | 'right'; driverShoulderHeightMm?: number; helmet: { xMm: number; yMm: number; zMm: number; radiusMm: number } };
  model: { nodes: CageNode[] };
  members: { id: string; kind: MemberKind; label?: string; odMm: number; wallMm: number; path: PathEntry[] }[];
}
export const HOOP = { halfWidthMm: 600, heightMm: 1150, clrMm: 150, odMm: 45 } as const;

export function cageSpec(over: { braceJunctionZ?: number; braceFootX?: number; clrMm?: number } = {}): FixtureSpec {
  const jz = over.braceJunctionZ ?? 1000;
  const fx = over.braceFootX ?? -900;
  const clr = over.clrMm ?? HOOP.clrMm;
  const w = HOOP.halfWidthMm;
  const h = HOOP.heightMm;
  return {
    vehicle: { classId: 'new_cage', driverSide: 'right', driverShoulderHeightMm: 900, helmet: { xMm: 250, yMm: -300, zMm: 900, radiusMm: 150 } },
    model: {
      nodes: [
        { id: 'fl', label: 'hoop foot left', role: 'foot', xMm: 0, yMm: w, zMm: 0 },
        { id: 'fr', label: 'hoop foot right', role: 'foot', xMm: 0, yMm: -w, zMm: 0 },
        { id: 'jl', label: 'backstay junction left', role: 'junction', xMm: 0, yMm: w, zMm: jz },
        { id: 'jr', label: 'backstay junction right', role: 'junction', xMm: 0, yMm: -w, zMm: jz },
        { id: 'tl', label: 'hoop top left', role: 'bend', xMm: 0, yMm: w, zMm: h },
        { id: 'tr', label: 'hoop top right', role: 'bend', xMm: 0, yMm: -w, zMm: h },
        { id: 'hl', label: 'harness bar left', role: 'junction', xMm: 0, yMm: w, zMm: 800 },
        { id: 'hr', label: 'harness bar right', role: 'junction', xMm: 0, yMm: -w, zMm: 800 },
        { id: 'bl', label: 'backstay foot left', role: 'foot', xMm: fx, yMm: w - 50, zMm: 300 },
        { id: 'br', label: 'backstay foot right', role: 'foot', xMm: fx, yMm: -(w - 50), zMm: 300 },
      ],
    },
    members: [
      { id: 'mh', kind: 'main_hoop', label: 'main hoop', odMm: HOOP.odMm, wallMm: 2.5,
        path: [{ nodeId: 'fl' }, { nodeId: 'hl' }, { nodeId: 'jl' }, { nodeId: 'tl', clrMm: clr }, { nodeId: 'tr', clrMm: clr }, { nodeId: 'jr' }, { nodeId: 'hr' }, { nodeId: 'fr' }] },
      { id: 'bsl', kind: 'rear_brace', label: 'backstay left', odMm: 38, wallMm: 2.5, path: [{ nodeId: 'jl' }, { nodeId: 'bl' }] },
      { id: 'bsr', kind: 'rear_brace', label: 'backstay right', odMm: 38, wallMm: 2.5, path: [{ nodeId: 'jr' }, { nodeId: 'br' }] },
      { id: 'hb', kind: 'harness_bar', label: 'harness bar', odMm: 38, wallMm: 2.5, path: [{ nodeId: 'hl' }, { nodeId: 'hr' }] },
      { id: 'dg', kind: 'diagonal', label: 'hoop diagonal', odMm: 38, wallMm: 2.5, path: [{ nodeId: 'fr' }, { nodeId: 'jl' }] },
    ],
  };
}

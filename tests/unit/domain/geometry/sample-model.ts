// A whole cage as a specification with a model, worked out by hand (values here are chosen, not
// from any car): a main hoop with two bent corners and junctions on its legs, two backstays to the
// chassis rails, a harness bar, and a front hoop. Used by the drawing and PDF tests.
import type { Specification } from '@backend/contracts/specification';

const lerp = (a: [number, number, number], b: [number, number, number], t: number) => a.map((v, i) => Math.round((v + (b[i]! - v) * t) * 10) / 10) as [number, number, number];
const at = (id: string, role: 'foot' | 'bend' | 'junction' | 'end', [xMm, yMm, zMm]: [number, number, number], label?: string) => ({ id, role, xMm, yMm, zMm, ...(label ? { label } : {}) });

const FOOT_L: [number, number, number] = [0, 560, 0];
const TOP_L: [number, number, number] = [-60, 470, 1130];

export function sampleModelSpecification(): Specification {
  return {
    vehicle: { classId: 'saloon', weightWithDriverKg: 1150, driverShoulderHeightMm: 700, helmet: { xMm: 330, yMm: 300, zMm: 930, radiusMm: 150 } },
    members: [
      { id: 'mh', kind: 'main_hoop', label: 'main hoop', odMm: 45, wallMm: 2.5, path: [{ nodeId: 'mh-fl' }, { nodeId: 'mh-jl' }, { nodeId: 'mh-tl', clrMm: 150 }, { nodeId: 'mh-tr', clrMm: 150 }, { nodeId: 'mh-jr' }, { nodeId: 'mh-fr' }] },
      { id: 'rb-l', kind: 'rear_brace', label: 'backstay left', odMm: 38, wallMm: 2, path: [{ nodeId: 'mh-jl' }, { nodeId: 'rb-fl' }] },
      { id: 'rb-r', kind: 'rear_brace', label: 'backstay right', odMm: 38, wallMm: 2, path: [{ nodeId: 'mh-jr' }, { nodeId: 'rb-fr' }] },
      { id: 'hb', kind: 'harness_bar', label: 'harness bar', odMm: 38, wallMm: 2, path: [{ nodeId: 'hb-l' }, { nodeId: 'hb-r' }] },
      { id: 'fh', kind: 'front_hoop', label: 'front hoop', odMm: 45, wallMm: 2.5, path: [{ nodeId: 'fh-fl' }, { nodeId: 'fh-tl', clrMm: 150 }, { nodeId: 'fh-tr', clrMm: 150 }, { nodeId: 'fh-fr' }] },
    ],
    model: {
      nodes: [
        at('mh-fl', 'foot', FOOT_L, 'main hoop foot left'),
        at('mh-jl', 'junction', lerp(FOOT_L, TOP_L, 0.86), 'backstay top left'),
        at('mh-tl', 'bend', TOP_L, 'hoop corner left'),
        at('mh-tr', 'bend', [-60, -470, 1130], 'hoop corner right'),
        at('mh-jr', 'junction', lerp([0, -560, 0], [-60, -470, 1130], 0.86), 'backstay top right'),
        at('mh-fr', 'foot', [0, -560, 0], 'main hoop foot right'),
        at('rb-fl', 'foot', [-900, 470, 250], 'backstay foot left'),
        at('rb-fr', 'foot', [-900, -470, 250], 'backstay foot right'),
        at('hb-l', 'junction', lerp(FOOT_L, TOP_L, 0.55), 'harness bar left'),
        at('hb-r', 'junction', lerp([0, -560, 0], [-60, -470, 1130], 0.55), 'harness bar right'),
        at('fh-fl', 'foot', [1150, 600, 0]),
        at('fh-tl', 'bend', [900, 520, 1080]),
        at('fh-tr', 'bend', [900, -520, 1080]),
        at('fh-fr', 'foot', [1150, -600, 0]),
      ],
    },
  };
}

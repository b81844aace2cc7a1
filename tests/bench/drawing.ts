// Drawing bench: after one edit (a node moved 1 mm), derive the model's geometry and draw the three
// views to SVG strings (drawCage, what the sheet does on every keystroke), for a 40-member model.
// Printed beside a bare loop over the same nodes measured in the same run, as a ratio.
import { drawCage } from '../../backend/src/domain/geometry/cage-drawing.js';
import type { Specification } from '../../backend/src/contracts/specification.js';
import type { Finding } from '../../backend/src/contracts/report.js';

export const MAX_DRAW_MS = 4;

/** A 40-member cage: two bent hoops, then straight bars between nodes along both sides and across. */
export function benchModel(): Specification {
  const nodes: NonNullable<Specification['model']>['nodes'] = [];
  const node = (id: string, role: 'foot' | 'bend' | 'junction' | 'end', xMm: number, yMm: number, zMm: number) => {
    nodes.push({ id, role, xMm, yMm, zMm });
    return { nodeId: id };
  };
  const members: Specification['members'] = [];
  for (const [name, x, kind] of [['mh', 0, 'main_hoop'], ['fh', 1100, 'front_hoop']] as const) {
    members.push({
      id: name, kind, odMm: 45, wallMm: 2.5,
      path: [node(`${name}-fl`, 'foot', x, 560, 0), { ...node(`${name}-tl`, 'bend', x - 60, 470, 1130), clrMm: 150 }, { ...node(`${name}-tr`, 'bend', x - 60, -470, 1130), clrMm: 150 }, node(`${name}-fr`, 'foot', x, -560, 0)],
    });
  }
  // 38 straight bars: rungs between the hoops at several heights on each side, and cross bars.
  for (let i = 0; members.length < 40; i += 1) {
    const z = 150 + (i % 19) * 50;
    const side = i < 19 ? 1 : -1;
    const a = node(`a${i}`, 'junction', 20, side * 540, z);
    const b = node(`b${i}`, 'junction', 1080, side * 540, z + 20);
    members.push({ id: `bar${i}`, kind: i % 2 ? 'door_bar' : 'other', odMm: 38, wallMm: 2, path: [a, b] });
  }
  return { vehicle: { classId: 'bench', helmet: { xMm: 350, yMm: 300, zMm: 950, radiusMm: 150 }, driverShoulderHeightMm: 700 }, members, model: { nodes } };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

export function runDrawingBench(rounds = 7, editsPerRound = 60): { drawMs: number; baselineMs: number; ratio: number; members: number; svgBytes: number } {
  const spec = benchModel();
  const findings: Finding[] = [];
  const moved = spec.model!.nodes.find((n) => n.id === 'a3')!;
  let sink = 0;
  let step = 1;
  const edit = () => {
    moved.zMm += step; // the edit: a node moved 1 mm, back and forth so it stays where a node can be
    step = -step;
  };
  const draw = () => {
    edit();
    const d = drawCage({ spec, findings, units: 'metric' });
    sink += d.svgs.side.length + d.svgs.top.length + d.svgs.front.length;
  };
  const bare = () => {
    edit();
    for (const n of spec.model!.nodes) sink += n.xMm + n.yMm + n.zMm;
  };
  for (let i = 0; i < 200; i += 1) draw(); // warm-up: the JIT settles first
  const draws: number[] = [];
  const bares: number[] = [];
  for (let r = 0; r < rounds; r += 1) {
    let t = performance.now();
    for (let i = 0; i < editsPerRound; i += 1) draw();
    draws.push((performance.now() - t) / editsPerRound);
    t = performance.now();
    for (let i = 0; i < editsPerRound * 100; i += 1) bare();
    bares.push((performance.now() - t) / (editsPerRound * 100));
  }
  const d = drawCage({ spec, findings, units: 'metric' });
  if (sink === 0) throw new Error('nothing drawn');
  const drawMs = median(draws);
  const baselineMs = median(bares);
  return { drawMs, baselineMs, ratio: drawMs / baselineMs, members: d.drawn.length, svgBytes: d.svgs.side.length + d.svgs.top.length + d.svgs.front.length };
}

// Geometry bench: deriving every value (members, nodes, geometry facts) of a 40-member cage model,
// against a bare loop over the same path entries measured in the same run. Target: ≤ 1 ms.
import { performance } from 'node:perf_hooks';
import { deriveCageGeometry, startingShape } from '../../backend/src/domain/geometry/index';
import type { GeometryInput } from '../../backend/src/domain/geometry/index';

export const GEOMETRY_TARGET_MS = 1;

/** The largest starting shape plus bent bars in two planes, to 40 members. */
export function fortyMemberModel(): GeometryInput {
  const r = startingShape(
    { harnessBar: true, front: 'halo', doorBars: 'crossed', diagonal: 'backstays' },
    { hoopWidthAtFeetMm: 1250, hoopWidthAtTopMm: 1050, hoopHeightMm: 1150, hoopLeanDeg: 8, frontHoopForwardMm: 1300, backstayLandingBehindMm: 900, doorBarHeightMm: 450 },
    (kind) => (kind.endsWith('hoop') ? { odMm: 45, wallMm: 2.5 } : { odMm: 38, wallMm: 2.5 }),
  );
  if (!r.ok) throw new Error(JSON.stringify(r.problems));
  const nodes = [...r.shape.nodes];
  const members: GeometryInput['members'][number][] = [...r.shape.members];
  for (let i = 0; members.length < 40; i++) {
    const x = -600 + i * 60;
    const y = (i % 2 === 0 ? 1 : -1) * (150 + (i % 5) * 40);
    const ids = [0, 1, 2, 3].map((k) => `b${i}-${k}`);
    nodes.push(
      { id: ids[0], role: 'end', xMm: x, yMm: y, zMm: 200 }, { id: ids[1], role: 'bend', xMm: x, yMm: y, zMm: 600 },
      { id: ids[2], role: 'bend', xMm: x, yMm: y + 350, zMm: 620 }, { id: ids[3], role: 'end', xMm: x + 400, yMm: y + 350, zMm: 700 },
    );
    members.push({ id: `bar-${i}`, kind: 'other', label: `bar ${i}`, odMm: 30, path: [{ nodeId: ids[0] }, { nodeId: ids[1], clrMm: 90 }, { nodeId: ids[2], clrMm: 90 }, { nodeId: ids[3] }] });
  }
  return { vehicle: { driverSide: 'right', driverShoulderHeightMm: 850, helmet: { xMm: 250, yMm: -300, zMm: 900, radiusMm: 140 } }, model: { nodes }, members };
}

const quantile = (xs: number[], q: number) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length * q)]!;

export async function runGeometryBench(options: { log?: boolean } = {}) {
  const spec = fortyMemberModel();
  const nodes = spec.model!.nodes;
  const entries = spec.members.reduce((s, m) => s + (m.path?.length ?? 0), 0);
  // Bare loop: look every path entry's node up and add its coordinates, nothing else.
  const byId = new Map(nodes.map((n) => [n.id, n]));
  let sink = 0;
  const bare = () => {
    for (const m of spec.members) for (const e of m.path ?? []) {
      const n = byId.get(e.nodeId)!;
      sink += n.xMm + n.yMm + n.zMm;
    }
  };
  const time = (fn: () => void, batch: number) => {
    const samples: number[] = [];
    for (let s = 0; s < 40; s++) {
      const t0 = performance.now();
      for (let i = 0; i < batch; i++) fn();
      samples.push((performance.now() - t0) / batch);
    }
    // The machine is shared: the 10th percentile of batch means is the cost with the least
    // interference; the median shows what contention adds.
    return { p10: quantile(samples, 0.1), median: quantile(samples, 0.5) };
  };
  for (let i = 0; i < 200; i++) deriveCageGeometry(spec); // warm-up
  const derive = time(() => { sink += deriveCageGeometry(spec).members.length; }, 25);
  const bareLoop = time(bare, 2000);
  if (options.log)
    console.log(`geometry: derive p10 ${derive.p10.toFixed(3)} ms, median ${derive.median.toFixed(3)} ms for ${spec.members.length} members (${entries} path entries); bare loop p10 ${(bareLoop.p10 * 1000).toFixed(2)} µs${sink > 0 ? '' : ' (?)'}`);
  return { members: spec.members.length, deriveMs: derive.p10, deriveMedianMs: derive.median, bareMs: bareLoop.p10, ratio: derive.p10 / bareLoop.p10 };
}

// Where the drawing gets member centrelines from. Until the model's own memberCentreline (with bend
// arcs) is on main, straight runs between the path's nodes stand in for it.
import type { Point3 } from './projection.js';

export function memberCentreline(nodes: readonly { id: string; xMm: number; yMm: number; zMm: number }[], path: readonly { nodeId: string }[], _odMm: number): Point3[] {
  const byId = new Map(nodes.map((n) => [n.id, n]));
  return path.flatMap((p) => {
    const n = byId.get(p.nodeId);
    return n ? [{ x: n.xMm, y: n.yMm, z: n.zMm }] : [];
  });
}

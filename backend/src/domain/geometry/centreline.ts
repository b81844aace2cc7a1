// A member's centreline for drawing and measuring, from the model's nodes and the member's path.
import type { CageNode, PathEntry } from './model.js';
import { nodeIndex, nodePoint } from './model.js';
import type { PathGeometry } from './member-path.js';
import { analysePath, sampleCentreline } from './member-path.js';
import type { Vec3 } from './vec.js';

type Nodes = readonly CageNode[] | ReadonlyMap<string, CageNode>;

const asMap = (nodes: Nodes): ReadonlyMap<string, CageNode> => (nodes instanceof Map ? nodes : nodeIndex(nodes as readonly CageNode[]));

/** The path's node positions, or null when a node is unknown. */
export function pathPoints(nodes: Nodes, path: readonly PathEntry[]): Vec3[] | null {
  const map = asMap(nodes);
  const out: Vec3[] = [];
  for (const e of path) {
    const n = map.get(e.nodeId);
    if (!n) return null;
    out.push(nodePoint(n));
  }
  return out;
}

/** The path's tube geometry, or null when the path is not a valid tube (the contract refuses those). */
export function pathGeometry(nodes: Nodes, path: readonly PathEntry[], odMm: number): PathGeometry | null {
  const points = pathPoints(nodes, path);
  if (!points || points.length < 2) return null;
  const r = analysePath(points, path.map((e) => e.clrMm), odMm);
  return r.ok ? r.geometry : null;
}

/**
 * The member's centreline as a sampled polyline in mm, including its bend arcs (chords stray at most
 * OD/40 from the arc, at least 0.25 mm). While a path is being edited and is not yet a valid tube,
 * this gives the straight polyline through the known nodes, so a drawing never disappears mid-edit.
 */
export function memberCentreline(nodes: Nodes, path: readonly PathEntry[], odMm: number): Vec3[] {
  const g = pathGeometry(nodes, path, odMm);
  if (g) return sampleCentreline(g, odMm);
  const map = asMap(nodes);
  return path.flatMap((e) => {
    const n = map.get(e.nodeId);
    return n ? [nodePoint(n)] : [];
  });
}

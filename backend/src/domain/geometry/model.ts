// The cage model's vocabulary and limits: nodes on tube centrelines in the cage frame (origin on the
// car's centreline at floor level in the plane of the main hoop's feet; x forward, y to the car's
// left, z up; millimetres), and member paths through them. See docs/geometry.md.
import type { Vec3 } from './vec.js';

export const NODE_ROLES = ['foot', 'bend', 'junction', 'end'] as const;
export type NodeRole = (typeof NODE_ROLES)[number];

export const MODEL_LIMITS = { nodes: 200, coordinateMm: 5000 } as const;

export interface CageNode {
  id: string;
  label?: string;
  role: NodeRole;
  xMm: number;
  yMm: number;
  zMm: number;
}

export interface PathEntry {
  nodeId: string;
  /** Centreline radius of a bend at this node; only on interior entries. */
  clrMm?: number;
}

export type MemberSide = 'left' | 'right' | 'centre';
export type DriverSide = 'left' | 'right';

export const nodePoint = (n: CageNode): Vec3 => ({ x: n.xMm, y: n.yMm, z: n.zMm });

/** Nodes by id; the first of a repeated id wins (the contract refuses repeats anyway). */
export function nodeIndex(nodes: readonly CageNode[]): Map<string, CageNode> {
  const map = new Map<string, CageNode>();
  for (const n of nodes) if (!map.has(n.id)) map.set(n.id, n);
  return map;
}

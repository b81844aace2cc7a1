// Mirroring in the car's centre plane (y → −y): one member to the other side of the car, as one
// action on the build sheet, and a whole model (for the property tests and a left-hand-drive copy).
import type { CageNode, PathEntry } from './model.js';

/** Nodes this close to a mirrored position are the same node (the other side's already exists). */
const SAME_NODE_MM = 0.5;

const SIDE_WORDS: Record<string, string> = { left: 'right', right: 'left', Left: 'Right', Right: 'Left' };
/** "backstay left" ↔ "backstay right"; ids ending "-l" ↔ "-r" (also "_l", ".l"). */
export function swapSideWords(text: string): string {
  return text.replace(/\b(left|right|Left|Right)\b/g, (w) => SIDE_WORDS[w] ?? w);
}
export function swapSideId(id: string): string {
  const m = /^(.*[-_.])(l|r|left|right)$/i.exec(id);
  if (!m) return id;
  const map: Record<string, string> = { l: 'r', r: 'l', left: 'right', right: 'left', L: 'R', R: 'L', Left: 'Right', Right: 'Left', LEFT: 'RIGHT', RIGHT: 'LEFT' };
  return m[1] + (map[m[2]] ?? map[m[2].toLowerCase()]);
}

function uniqueId(wanted: string, taken: ReadonlySet<string>): string {
  if (!taken.has(wanted)) return wanted;
  for (let i = 2; ; i++) if (!taken.has(`${wanted}-${i}`)) return `${wanted}-${i}`;
}

export interface MirrorableMember {
  id: string;
  label?: string;
  path?: PathEntry[];
}

export type MirrorOutcome<M> =
  | { ok: true; nodes: CageNode[]; member: M }
  | { ok: false; message: string };

/**
 * The member's mirror image on the other side: its nodes mirrored (reusing a node already there),
 * a new id and label with left and right swapped. The member itself is not changed.
 */
export function mirrorMember<M extends MirrorableMember>(nodes: readonly CageNode[], members: readonly MirrorableMember[], member: M): MirrorOutcome<M> {
  const name = (m: MirrorableMember) => m.label?.trim() || m.id;
  if (!member.path) return { ok: false, message: 'Only a member with a path through the model can be mirrored.' };
  const byId = new Map(nodes.map((n) => [n.id, n]));
  const out = [...nodes];
  const taken = new Set(nodes.map((n) => n.id));
  const mapped = new Map<string, string>();
  let crosses = true;
  for (const e of member.path) {
    const n = byId.get(e.nodeId);
    if (!n) return { ok: false, message: `No node has the id "${e.nodeId}".` };
    if (mapped.has(n.id)) continue;
    const twin = out.find((o) => Math.abs(o.xMm - n.xMm) <= SAME_NODE_MM && Math.abs(o.yMm + n.yMm) <= SAME_NODE_MM && Math.abs(o.zMm - n.zMm) <= SAME_NODE_MM);
    if (twin) mapped.set(n.id, twin.id);
    else {
      const id = uniqueId(swapSideId(n.id) === n.id ? `${n.id}-mirror` : swapSideId(n.id), taken);
      taken.add(id);
      out.push({ ...n, id, ...(n.label ? { label: swapSideWords(n.label) } : {}), yMm: -n.yMm });
      mapped.set(n.id, id);
    }
    if (!member.path.some((x) => x.nodeId === mapped.get(n.id))) crosses = false;
  }
  if (crosses) return { ok: false, message: 'This member is its own mirror image (it crosses the car symmetrically).' };
  // Mirroring twice would lay a second tube over the first: say which member is already there.
  const path0 = member.path.map((e) => mapped.get(e.nodeId)!);
  const key = (ids: readonly string[]) => [ids.join('>'), [...ids].reverse().join('>')];
  const twinMember = members.find((m) => m !== member && m.path && key(m.path.map((e) => e.nodeId)).includes(path0.join('>')));
  if (twinMember) return { ok: false, message: `${name(twinMember)} is already on the other side, on the mirrored nodes.` };
  const memberIds = new Set(members.map((m) => m.id));
  const id = uniqueId(swapSideId(member.id) === member.id ? `${member.id}-mirror` : swapSideId(member.id), memberIds);
  const path = member.path.map((e) => ({ ...e, nodeId: mapped.get(e.nodeId)! }));
  const label = member.label ? swapSideWords(member.label) : undefined;
  return { ok: true, nodes: out, member: { ...member, id, ...(label !== undefined ? { label } : {}), path } };
}

/** The whole model in the centre plane: y → −y, and the driver's side and typed sides swapped. */
export function mirrorSpecification<S extends {
  vehicle: { driverSide?: 'left' | 'right'; helmet?: { xMm: number; yMm: number; zMm: number; radiusMm: number } };
  members: { id: string; side?: 'left' | 'right' | 'centre' }[];
  model?: { nodes: CageNode[] };
}>(spec: S): S {
  const other = (s: 'left' | 'right') => (s === 'left' ? 'right' : 'left');
  const v = spec.vehicle;
  return {
    ...spec,
    vehicle: {
      ...v,
      ...(v.driverSide ? { driverSide: other(v.driverSide) } : {}),
      ...(v.helmet ? { helmet: { ...v.helmet, yMm: -v.helmet.yMm } } : {}),
    },
    members: spec.members.map((m) => (m.side === 'left' || m.side === 'right' ? { ...m, side: other(m.side) } : m)),
    ...(spec.model ? { model: { nodes: spec.model.nodes.map((n) => ({ ...n, yMm: -n.yMm })) } } : {}),
  };
}

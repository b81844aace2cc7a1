// The name a builder reads for a member: their own label, else the kind's words with a number when
// the cage has more than one of that kind. Never the internal id.
import type { MemberKind } from '../vocabulary.js';
import { MEMBER_KIND_LABELS } from '../vocabulary.js';

export interface NamedMember {
  id: string;
  kind: MemberKind;
  label?: string;
}

export function memberName(members: readonly NamedMember[], index: number): string {
  const m = members[index];
  const label = m.label?.trim();
  if (label) return label;
  const kindWords = MEMBER_KIND_LABELS[m.kind];
  const same = members.filter((x) => x.kind === m.kind);
  if (same.length < 2) return kindWords;
  const ordinal = members.slice(0, index + 1).filter((x) => x.kind === m.kind).length;
  return `${kindWords} ${ordinal}`;
}

/** Every member's name, in one pass over the list (the drawing asks on every keystroke). */
export function memberNames(members: readonly NamedMember[]): string[] {
  const total = new Map<MemberKind, number>();
  for (const m of members) total.set(m.kind, (total.get(m.kind) ?? 0) + 1);
  const seen = new Map<MemberKind, number>();
  return members.map((m) => {
    const ordinal = (seen.get(m.kind) ?? 0) + 1;
    seen.set(m.kind, ordinal);
    const label = m.label?.trim();
    if (label) return label;
    const kindWords = MEMBER_KIND_LABELS[m.kind];
    return total.get(m.kind)! < 2 ? kindWords : `${kindWords} ${ordinal}`;
  });
}

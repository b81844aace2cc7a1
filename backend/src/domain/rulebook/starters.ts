// Starting points for new rules in the rulebook editor and for a blank rulebook: each is deliberately
// unfinished (no section, no sizes, no checks), so the document's validation names what is still to fill
// in and a starter can never be put in force as it stands. Pure data: the browser imports it too.
import type { Requirement } from '../../contracts/ruleset.js';

export type StarterKind = 'tube_table' | 'required_members' | 'limit';

/** A requirement id not yet used in the document: `tubes-1`, `tubes-2` … */
export function freeRequirementId(prefix: string, taken: readonly { id: string }[]): string {
  const ids = new Set(taken.map((r) => r.id));
  let n = 1;
  while (ids.has(`${prefix}-${n}`)) n++;
  return `${prefix}-${n}`;
}

/** A tube table for main hoops with one band and no sizes listed yet. */
export function starterTubeTable(taken: readonly { id: string }[] = []): Requirement {
  return {
    id: freeRequirementId('tubes', taken),
    title: 'Tube sizes',
    section: '',
    severity: 'mandatory',
    area: 'tubes',
    scope: { kind: 'member', memberKinds: ['main_hoop'] },
    requires: { template: 'tube_table', bands: [{ rows: [{ alternatives: [] }] }] },
    explanation: '',
  };
}

export function starterRequirement(kind: StarterKind, taken: readonly { id: string }[]): Requirement {
  switch (kind) {
    case 'tube_table':
      return starterTubeTable(taken);
    case 'required_members':
      return {
        id: freeRequirementId('members', taken),
        title: 'Required members',
        section: '',
        severity: 'mandatory',
        area: 'members',
        scope: { kind: 'vehicle' },
        requires: { template: 'required_members', members: [{ kinds: ['main_hoop'], min: 1 }] },
        explanation: '',
      };
    case 'limit':
      return {
        id: freeRequirementId('limits', taken),
        title: 'Limits',
        section: '',
        severity: 'mandatory',
        area: 'geometry',
        scope: { kind: 'vehicle' },
        requires: { template: 'limit', checks: [] },
        explanation: '',
      };
  }
}

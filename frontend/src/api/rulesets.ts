// A club's published rulebooks and one ruleset version with its document (docs/api.md, "Rulesets and
// checks"). Versions are immutable once published, so a fetched document is kept for the tab's life.
import { http } from './http';
import type { RulebookWire, RulebooksListWire, RulesetVersionWire } from '@contracts/checks';

export type { RulebookWire as Rulebook, RulesetVersionWire as RulesetVersion, RulesetClassWire as RulesetClass } from '@contracts/checks';

export async function listRulebooks(clubId: string): Promise<RulebookWire[]> {
  return (await http.get<RulebooksListWire>(`/clubs/${encodeURIComponent(clubId)}/rulebooks`)).rulebooks;
}

const versions = new Map<string, Promise<RulesetVersionWire>>();

export function getRulesetVersion(versionId: string): Promise<RulesetVersionWire> {
  let pending = versions.get(versionId);
  if (!pending) {
    pending = http
      .get<RulesetVersionWire | { version: RulesetVersionWire }>(`/ruleset-versions/${encodeURIComponent(versionId)}`)
      .then((body) => ('version' in body ? body.version : body));
    // A failure is not kept: the next call asks again.
    pending.catch(() => versions.delete(versionId));
    versions.set(versionId, pending);
  }
  return pending;
}

/** Tests and sign-out start from nothing. */
export function forgetRulesetVersions(): void {
  versions.clear();
}

// A club's published rulebooks and one ruleset version with its document (docs/api.md, "Rulesets and
// checks"). Versions are immutable once published, so a fetched document is kept for the tab's life,
// and on the device (kept.ts) for the sheet's class list and live pre-check with no signal: an edition
// seen once opens offline. Drafts change, so they are never kept on the device.
import { http, isUnreachable } from './http';
import { keep, keepNewest, recall } from './kept';
import type { RulebookWire, RulebooksListWire, RulesetVersionWire } from '@contracts/checks';

export type { RulebookWire as Rulebook, RulesetVersionWire as RulesetVersion, RulesetClassWire as RulesetClass } from '@contracts/checks';

export async function listRulebooks(clubId: string): Promise<RulebookWire[]> {
  return (await http.get<RulebooksListWire>(`/clubs/${encodeURIComponent(clubId)}/rulebooks`)).rulebooks;
}

const versions = new Map<string, Promise<RulesetVersionWire>>();
/** How many editions the device keeps: a builder's sheets name a handful at most. */
export const KEPT_EDITIONS = 6;

export function getRulesetVersion(versionId: string): Promise<RulesetVersionWire> {
  let pending = versions.get(versionId);
  if (!pending) {
    pending = http
      .get<RulesetVersionWire | { version: RulesetVersionWire }>(`/ruleset-versions/${encodeURIComponent(versionId)}`)
      .then((body) => ('version' in body ? body.version : body))
      .then((version) => {
        if (version.status !== 'draft' && keep('edition', null, versionId, version)) keepNewest('edition', null, KEPT_EDITIONS);
        return version;
      })
      .catch((error: unknown) => {
        // No signal: the copy this device kept when it last read the edition (its document cannot have changed).
        const kept = isUnreachable(error) ? recall<RulesetVersionWire>('edition', null, versionId) : null;
        if (kept) return kept.value;
        throw error;
      });
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

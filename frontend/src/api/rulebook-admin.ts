// Rulebook administration calls (docs/api.md, "Rulebook administration"): new rulebooks, drafts,
// autosave, import, compare, impact, publish, retire, export, and the publish job's progress.
import { http } from './http';
import type { RulesetVersionWire } from '@contracts/checks';
import type { ImpactWire, PublishedWire, SavedDraftWire, DraftConflictDetails } from '@contracts/rulebook-admin';
import type { RulesetChange } from '@domain/rulebook/diff';
import type { JobProgressWire } from '@contracts/jobs';

export type { ImpactWire, PublishedWire, SavedDraftWire, DraftConflictDetails, RulesetChange, JobProgressWire };

const enc = encodeURIComponent;

/** A new rulebook: blank (title, publisher, edition, units) or from a ruleset file's text. */
export type NewRulebook =
  | { start: 'blank'; title: string; publisher: string; edition: string; unitSystem: 'imperial' | 'metric' }
  | { start: 'file'; text: string };

export async function createRulebook(clubId: string, body: NewRulebook): Promise<RulesetVersionWire> {
  return (await http.post<{ version: RulesetVersionWire }>(`/clubs/${enc(clubId)}/rulebooks`, body)).version;
}

export async function startDraft(rulebookId: string): Promise<RulesetVersionWire> {
  return (await http.post<{ version: RulesetVersionWire }>(`/rulebooks/${enc(rulebookId)}/drafts`)).version;
}

export async function loadVersion(versionId: string): Promise<RulesetVersionWire> {
  return (await http.get<{ version: RulesetVersionWire }>(`/ruleset-versions/${enc(versionId)}`)).version;
}

export async function saveDraft(versionId: string, lockVersion: number, document: unknown): Promise<SavedDraftWire> {
  return (await http.put<{ draft: SavedDraftWire }>(`/ruleset-drafts/${enc(versionId)}`, { lockVersion, document })).draft;
}

export async function importDraft(versionId: string, lockVersion: number, text: string): Promise<SavedDraftWire> {
  return (await http.post<{ draft: SavedDraftWire }>(`/ruleset-drafts/${enc(versionId)}/import`, { lockVersion, text })).draft;
}

export async function deleteDraft(versionId: string): Promise<void> {
  await http.delete(`/ruleset-drafts/${enc(versionId)}`);
}

/** Starts working out the draft's impact (a background job); follow it with jobProgress. */
export async function startImpact(versionId: string): Promise<JobProgressWire> {
  return (await http.post<{ job: JobProgressWire }>(`/ruleset-drafts/${enc(versionId)}/impact`)).job;
}

export async function publishDraft(versionId: string, lockVersion: number, effectiveDate: string): Promise<PublishedWire> {
  return (await http.post<{ published: PublishedWire }>(`/ruleset-drafts/${enc(versionId)}/publish`, { lockVersion, effectiveDate })).published;
}

export async function retireVersion(versionId: string): Promise<RulesetVersionWire> {
  return (await http.post<{ version: RulesetVersionWire }>(`/ruleset-versions/${enc(versionId)}/retire`)).version;
}

export async function compareVersions(versionId: string, otherId: string): Promise<{ from: number; to: number; changes: RulesetChange[] }> {
  return http.get(`/ruleset-versions/${enc(versionId)}/compare/${enc(otherId)}`);
}

/** The download address of a version's document (the browser saves it; the server names the file). */
export function exportUrl(versionId: string): string {
  return `/api/ruleset-versions/${enc(versionId)}/export`;
}

export async function jobProgress(jobId: string): Promise<JobProgressWire> {
  return (await http.get<{ job: JobProgressWire }>(`/jobs/${enc(jobId)}`)).job;
}

/** Runs a job that finally failed again; it resumes from what it stored. */
export async function retryJob(jobId: string): Promise<JobProgressWire> {
  return (await http.post<{ job: JobProgressWire }>(`/jobs/${enc(jobId)}/retry`)).job;
}

// A build sheet's unsaved draft as this device keeps it (api/kept.ts) until it is saved: the parsed
// values, the class, the revision it started from (so a save after reconnecting meets a newer revision
// through the conflict view), and the raw text of every typed number, bad ones included, in the units
// it was typed in. Kept per user and sheet; forgotten at sign-out.
import type { UnitSystem } from '@domain/units';
import { forget, keep, recall, type Kept } from '@/api/kept';
import type { SheetDraft } from './useBuildSheetDraft';

/** What was typed into one number input, and the value it stood for when typed. */
export interface TypedText {
  text: string;
  /** The canonical value the input held (the parsed text, or the old value when the text is bad). */
  value: number | undefined;
  /** True when the text is not a number the input accepts (yet): the draft cannot hold it. */
  bad: boolean;
}

export interface KeptSheetDraft {
  baseRevision: number;
  classId: string | null;
  units: UnitSystem;
  draft: SheetDraft;
  /** Typed text by input path (`members.0.wallMm`). */
  typed: Record<string, TypedText>;
}

export function keepSheetDraft(userId: string, sheetId: string, kept: KeptSheetDraft): boolean {
  return keep('draft', userId, sheetId, kept);
}

export function recallSheetDraft(userId: string, sheetId: string): Kept<KeptSheetDraft> | null {
  const kept = recall<KeptSheetDraft>('draft', userId, sheetId);
  return kept && typeof kept.value.baseRevision === 'number' && kept.value.draft ? kept : null;
}

export function forgetSheetDraft(userId: string, sheetId: string): void {
  forget('draft', userId, sheetId);
}

/** True when some input holds text the draft cannot (a half-typed number): that is unsaved work too. */
export function hasBadText(typed: Readonly<Record<string, TypedText>>): boolean {
  return Object.values(typed).some((t) => t.bad);
}

/** The same canonical value (both empty, or equal to a nanometre): the kept text still belongs here. */
export function sameValue(a: number | undefined, b: number | undefined): boolean {
  return a === undefined || b === undefined ? a === b : Math.abs(a - b) <= 1e-6;
}

// The words for rulebook editions and their dates, read by the server (the re-check e-mail) and the
// client (rulebook pages, the build sheet's newer-edition banner), so the mail and the screen it
// links to say the same thing. Dates are the club's calendar dates (YYYY-MM-DD), shown as "1 Jan 2028".
import { formatIsoDate } from '../domain/dates.js';
import { CHECK_VERDICT_WORDS, type CheckVerdictKey } from './verdict-words.js';

export type EditionStatusKey = 'draft' | 'scheduled' | 'published' | 'superseded' | 'retired';

export const EDITION_STATUS_WORDS: Readonly<Record<EditionStatusKey, { label: string; severity: 'info' | 'success' | 'secondary' | 'warn'; hint: string }>> = {
  draft: { label: 'Being written', severity: 'info', hint: 'Only admins see it; changes save by themselves.' },
  scheduled: { label: 'Scheduled', severity: 'info', hint: 'Published ahead of its date: the edition before it stays in force until then. It can never change.' },
  published: { label: 'In force', severity: 'success', hint: 'Builders check against it. It can never change.' },
  superseded: { label: 'Replaced', severity: 'secondary', hint: 'A newer edition is in force; older checks still cite this one.' },
  retired: { label: 'Withdrawn', severity: 'warn', hint: 'No new checks against it; saved checks keep citing it.' },
};

/** "in force since 1 Jan 2027", "in force from 1 Jan 2028 (scheduled)", "not in force yet" for a draft. */
export function editionDateText(status: EditionStatusKey, effectiveDate: string): string {
  const date = formatIsoDate(effectiveDate);
  switch (status) {
    case 'draft':
      return 'not in force yet';
    case 'scheduled':
      return `in force from ${date} (scheduled)`;
    case 'published':
      return `in force since ${date}`;
    case 'superseded':
      return `took effect ${date}, since replaced`;
    case 'retired':
      return `took effect ${date}, withdrawn`;
  }
}

export interface NewerEditionFacts {
  rulebookTitle: string;
  /** The edition the sheet is pinned to. */
  pinnedEdition: string;
  newerEdition: string;
  newerStatus: 'published' | 'scheduled';
  /** YYYY-MM-DD, the club's date the newer edition applies from. */
  effectiveDate: string;
  /** The sheet's latest revision under the edition it names; null when not checked yet. */
  verdictNow: CheckVerdictKey | null;
  /** The same revision under the newer edition; null when the newer edition lacks the sheet's class. */
  verdictUnder: CheckVerdictKey | null;
  className: string;
}

/** What the banner and the re-check mail say about a newer edition, line by line. */
export function newerEditionLines(f: NewerEditionFacts): { headline: string; pinned: string; verdicts: string; action: string } {
  const date = formatIsoDate(f.effectiveDate);
  const headline =
    f.newerStatus === 'scheduled'
      ? `${f.rulebookTitle}, edition ${f.newerEdition}, applies from ${date}. It is not in force yet.`
      : `${f.rulebookTitle}, edition ${f.newerEdition}, is in force since ${date}.`;
  const now = f.verdictNow ? CHECK_VERDICT_WORDS[f.verdictNow].sentence : 'is not checked yet';
  const under = f.verdictUnder
    ? `from ${date}, under edition ${f.newerEdition}, it ${CHECK_VERDICT_WORDS[f.verdictUnder].sentence}`
    : `edition ${f.newerEdition} has no class "${f.className}", so the sheet cannot move to it as it is`;
  return {
    headline,
    pinned: `This build sheet is checked against edition ${f.pinnedEdition} and stays on it until you move it.`,
    verdicts: `Under edition ${f.pinnedEdition} it ${now}; ${under}.`,
    action: f.verdictUnder
      ? `Moving it to edition ${f.newerEdition} saves it as a new revision; earlier revisions and their checks keep edition ${f.pinnedEdition}.`
      : 'Start a new build sheet for a class of the newer edition instead.',
  };
}

// The pre-check report as a pdfmake document definition, built by a pure function from a saved
// check run and what the garage knows about the car (rendering is pdf-engine's job). Every number
// is formatted from canonical units with the domain's formatQuantity in the reader's units. Noto
// Sans has no "≥", "≤" or "→" glyphs, so text passes through pdfSafe before it reaches the page.
import { findingReason } from '../domain/rules/reason-text';
import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces';
import type { CutListRowWire, TubeDataWire } from '../contracts/garage';
import type { CheckReport, Finding, MeasuredValue, RequiredValue } from '../contracts/report';
import { AREAS } from '../contracts/ruleset';
import { referenceWords } from '../domain/rules/reference-words';
import { findingKey, overallWithWaivers } from '../domain/review/waivers';
import { approvedText, CHECK_VERDICT_WORDS, FINDING_VERDICT_WORDS } from '../contracts/verdict-words';
import { formatQuantity, type Dimension, type UnitSystem } from '../domain/units';
import { calendarDateIn, clockTimeIn, formatIsoDate } from '../domain/dates';
import { MEMBER_KIND_LABELS } from '../domain/vocabulary';
import type { BuyingList } from '../domain/fabrication/nesting';
import { LEGEND_MARKS } from '../domain/geometry/verdict-marks';
import { legendSwatchSvg } from '../domain/geometry/view-svg';
import type { ViewName } from '../domain/geometry/projection';

export const REPORT_TITLE = 'Cagewright pre-check report';
export const SAFETY_CAUTION =
  'Cagewright gives a pre-check only. The sanctioning body’s inspector decides whether a cage passes. ' +
  'Welding and fabrication belong to qualified people working under local rules.';

export interface ReportPhoto {
  /** JPEG bytes of the thumbnail. */
  thumbnail: Buffer;
  caption: string;
  /** "main hoop mh", "mounting" */
  label: string;
}

export interface ReportDocumentInput {
  report: CheckReport;
  units: UnitSystem;
  car: { name: string; raceNumber: string | null; make: string | null; model: string | null; year: number | null } | null;
  builderName: string | null;
  sheetName: string | null;
  revisionNumber: number | null;
  verificationCode: string;
  /** Where anyone may look the code up (the public /verify page), printed beside the code. */
  lookUpUrl?: string;
  checkedAt: Date;
  /** The time zone of the club whose rulebook the run was checked against: "Checked on" is that club's date (UTC when omitted). */
  checkedTimeZone?: string;
  /** Tube data with the cut list, computed from the specification that was checked. */
  tubeData: TubeDataWire;
  photos: ReportPhoto[];
  /** A steward's approval of the submitted check: record number, decision, waivers, QR of the verification link. */
  review?: ReportReview;
  /** The tube to buy, nested into sticks (from the model's cut lengths where there is one). */
  buyingList?: BuyingList;
  /** The cage views (domain/geometry drawCage, the same SVG strings as the screen), when the sheet has a model. */
  cage?: { svgs: Record<ViewName, string>; drawnMembers: number; totalMembers: number };
  /** The checked sheet's approval and build dates and maker's certificate, when it gives them. */
  cageHistory?: { approvedOn?: string; builtOn?: string; certificate?: { issuer?: string; number: string } };
}

/** Rows for the cage's dates and certificate; none for a sheet that gives none. */
export function cageRows(cage: ReportDocumentInput['cageHistory']): [string, string][] {
  if (!cage) return [];
  const rows: [string, string][] = [];
  if (cage.approvedOn) rows.push(['Cage approved on', formatIsoDate(cage.approvedOn)]);
  if (cage.builtOn) rows.push(['Cage built on', formatIsoDate(cage.builtOn)]);
  if (cage.certificate) rows.push(["Maker's certificate", `${cage.certificate.number}${cage.certificate.issuer ? `, ${cage.certificate.issuer}` : ''}`]);
  return rows;
}

export interface ReportReview {
  recordNumber: string;
  /** valid, expired, superseded or revoked when the PDF is made. */
  recordStatus: string;
  stewardName: string;
  decidedAt: Date;
  expiresAt: Date;
  /** The club's time zone: the dates and times printed are the club's. */
  timeZone: string;
  note: string | null;
  /** findingKey of domain/review/waivers.ts → the steward's reason. */
  waivers: { findingKey: string; reason: string; stewardName: string }[];
  verificationUrl: string;
  /** The QR code of verificationUrl as an SVG document. */
  qrSvg: string;
  /** The record's track inspections, newest first (absent or empty: none yet). */
  inspections?: ReportInspection[];
}

export interface ReportInspection {
  inspectedAt: Date;
  sealNumber: string;
  stewardName: string;
  readings: { memberName: string; wallMm: number; minWallMm: number | null; belowMinimum: boolean }[];
}

const COLOURS = { ink: '#1d2327', muted: '#5b6670', rule: '#c9d0d6', band: '#eef1f3', pass: '#1f6f43', fail: '#a3261d', info: '#8a5a00', na: '#5b6670' };

// The words every screen uses (contracts/verdict-words.ts), so the PDF and the screens agree.
const VERDICT_WORDS: Readonly<Record<Finding['verdict'], string>> = FINDING_VERDICT_WORDS;
const VERDICT_COLOURS: Readonly<Record<Finding['verdict'], string>> = {
  pass: COLOURS.pass, fail: COLOURS.fail, needs_information: COLOURS.info, not_applicable: COLOURS.na,
};
const OVERALL_WORDS: Readonly<Record<CheckReport['verdict'], string>> = {
  pass: CHECK_VERDICT_WORDS.pass.banner, fail: CHECK_VERDICT_WORDS.fail.banner, needs_information: CHECK_VERDICT_WORDS.needs_information.banner,
};
const AREA_TITLES: Readonly<Record<(typeof AREAS)[number], string>> = {
  tubes: 'Tubes', members: 'Members', geometry: 'Geometry', mounting: 'Mounting', padding: 'Padding', welding: 'Welding', material: 'Material',
};
const OPERATOR_WORDS: Readonly<Record<RequiredValue['operator'], string>> = {
  atLeast: 'at least', atMost: 'at most', above: 'more than', below: 'less than', equals: 'exactly', notEquals: 'not',
  oneOf: 'one of', noneOf: 'none of', includes: 'includes', excludes: 'does not include',
};

/** Replaces characters Noto Sans cannot draw with words, so nothing silently vanishes from the page. */
export function pdfSafe(text: string): string {
  return text
    .replace(/\s*≥\s*/g, ' at least ')
    .replace(/\s*≤\s*/g, ' at most ')
    .replace(/\s*→\s*/g, ' to ')
    .replace(/\s*≠\s*/g, ' not ')
    // Vocabulary words that slip into generated sentences (mild_steel) read better as words.
    .replace(/\b[a-z0-9]+(?:_[a-z0-9]+)+\b/g, (w) => w.replace(/_/g, ' '))
    .replace(/ {2,}/g, ' ')
    .trim();
}

// Vocabulary words as the trade writes them; anything else just loses its underscores.
const WORDS: Readonly<Record<string, string>> = {
  dom: 'DOM', erw: 'ERW', cds: 'CDS', tig: 'TIG', mig: 'MIG', chromoly_4130: '4130 chromoly', sfi_45_1: 'SFI 45.1',
  fia_8857_2001: 'FIA 8857-2001', non_homologated: 'non-homologated',
};
const humanize = (s: string) => WORDS[s] ?? s.replace(/_/g, ' ');

function quantity(value: number, dimension: Dimension | null, units: UnitSystem): string {
  return dimension ? formatQuantity(value, dimension, units).text : String(value);
}

function scalarText(value: number | string | boolean, dimension: Dimension | null, units: UnitSystem): string {
  if (typeof value === 'number') return quantity(value, dimension, units);
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  return humanize(value);
}

export function measuredText(m: MeasuredValue, units: UnitSystem): string {
  return pdfSafe(`${m.label}: ${scalarText(m.value, m.dimension, units)}`);
}

export function requiredText(r: RequiredValue, units: UnitSystem): string {
  const v = r.value;
  const value = Array.isArray(v)
    ? v.map(humanize).join(', ')
    : typeof v === 'object'
      ? referenceWords(v, units)
      : scalarText(v, r.dimension, units);
  return pdfSafe(`${r.label}: ${OPERATOR_WORDS[r.operator]} ${value}`);
}

/** The builder's name for a finding's member; runs stored before names were carried fall back to kind and id. */
function subjectText(f: Finding): string {
  if (f.member) return f.member.name ? pdfSafe(f.member.name) : `${MEMBER_KIND_LABELS[f.member.kind]} "${f.member.id}"`;
  if (f.plate) return `plate "${f.plate.id}" (${humanize(f.plate.location)})`;
  return 'whole car';
}

export function tubeSizeText(odMm: number, wallMm: number, units: UnitSystem): string {
  const od = formatQuantity(odMm, 'length', units);
  const wall = formatQuantity(wallMm, 'length', units);
  return `${od.value.toFixed(od.decimals)} × ${wall.text}`;
}

/** Findings grouped by area, in the ruleset format's area order; empty areas are left out. */
export function findingsByArea(findings: readonly Finding[]): { area: (typeof AREAS)[number]; title: string; findings: Finding[] }[] {
  return AREAS.map((area) => ({ area, title: AREA_TITLES[area], findings: findings.filter((f) => f.area === area) })).filter((g) => g.findings.length > 0);
}

function labelValueTable(rows: [string, string][]): Content {
  return {
    table: { widths: [110, '*'], body: rows.map(([k, v]) => [{ text: k, color: COLOURS.muted }, { text: pdfSafe(v) }]) },
    layout: 'noBorders',
    margin: [0, 0, 0, 4],
  };
}

/** Findings of one requirement, in report order: the rule is cited once, then one row per subject. */
export function findingsByRequirement(findings: readonly Finding[]): Finding[][] {
  const groups = new Map<string, Finding[]>();
  for (const f of findings) {
    const list = groups.get(f.requirementId) ?? [];
    list.push(f);
    groups.set(f.requirementId, list);
  }
  return [...groups.values()];
}

type WaiverText = { reason: string; stewardName: string };

function requirementBlock(findings: readonly Finding[], units: UnitSystem, waived: ReadonlyMap<string, WaiverText> = new Map()): Content {
  const first = findings[0]!;
  const rows: TableCell[][] = findings.map((f) => {
    const waiver = waived.get(findingKey(f));
    const isWaived = waiver !== undefined;
    const details: Content[] = [];
    if (f.measured.length) details.push({ text: [{ text: 'Measured ', color: COLOURS.muted }, f.measured.map((m) => measuredText(m, units)).join('; ')] });
    if (f.required.length) details.push({ text: [{ text: 'Required ', color: COLOURS.muted }, f.required.map((r) => requiredText(r, units)).join('; ')] });
    if (f.missing.length) details.push({ text: [{ text: 'Missing ', color: COLOURS.muted }, f.missing.map((m) => pdfSafe(m.label)).join('; ')] });
    // Written from the stored parts in this PDF's units; a run stored before parts keeps its text.
    const reason = findingReason(f, units);
    if (reason) details.push({ text: pdfSafe(reason) });
    if (waiver) details.push({ text: [{ text: `Waived by ${pdfSafe(waiver.stewardName)}: `, bold: true }, pdfSafe(waiver.reason)] });
    return [
      { text: isWaived ? FINDING_VERDICT_WORDS.waived : VERDICT_WORDS[f.verdict], bold: true, color: isWaived ? COLOURS.info : VERDICT_COLOURS[f.verdict] },
      { text: subjectText(f) },
      { stack: details },
    ];
  });
  const parts: Content[] = [
    {
      columns: [
        { text: [{ text: pdfSafe(first.title), bold: true }, ...(first.severity === 'advisory' ? [{ text: '  advisory', color: COLOURS.muted }] : [])], width: '*' },
        { text: `Section ${pdfSafe(first.citation.section)}`, bold: true, width: 'auto', alignment: 'right' },
      ],
      margin: [0, 4, 0, 1],
    },
    ...(first.explanation ? [{ text: pdfSafe(first.explanation), color: COLOURS.muted, fontSize: 8, margin: [0, 0, 0, 2] } as Content] : []),
    {
      table: { widths: [74, 92, '*'], body: rows, dontBreakRows: true },
      layout: { hLineWidth: (i: number) => (i === 0 ? 0 : 0.4), vLineWidth: () => 0, hLineColor: () => COLOURS.rule, paddingLeft: (i: number) => (i === 0 ? 0 : 4), paddingTop: () => 2, paddingBottom: () => 2 },
      fontSize: 8.5,
      margin: [0, 0, 0, 4],
    },
  ];
  // A short rule stays on one page with its heading; a long one may break between subjects.
  return { stack: parts, unbreakable: findings.length <= 4 };
}

const headerCell = (text: string, alignment: 'left' | 'right' = 'left'): TableCell => ({ text, bold: true, fillColor: COLOURS.band, alignment, fontSize: 8.5 });
const numberCell = (text: string): TableCell => ({ text, alignment: 'right', fontSize: 8.5 });

function tubeTable(data: TubeDataWire, units: UnitSystem): Content {
  const q = (v: number, d: Dimension) => formatQuantity(v, d, units).text;
  const body: TableCell[][] = [
    ['Member', 'Size (OD × wall)', 'Area A', 'I', 'Z', 'Mass per length', 'Length', 'Mass'].map((h, i) => headerCell(h, i < 2 ? 'left' : 'right')),
    ...data.members.map((m) => [
      { text: `${pdfSafe(m.name ?? m.memberId)}\n${MEMBER_KIND_LABELS[m.kind]}`, fontSize: 8.5 },
      { text: tubeSizeText(m.odMm, m.wallMm, units), fontSize: 8.5 },
      numberCell(q(m.areaMm2, 'area')),
      numberCell(q(m.secondMomentMm4, 'second_moment')),
      numberCell(q(m.sectionModulusMm3, 'section_modulus')),
      numberCell(q(m.massPerMetreKg, 'mass_per_length')),
      numberCell(m.lengthMm === null ? 'not given' : q(m.lengthMm, 'length')),
      numberCell(m.massKg === null ? '' : q(m.massKg, 'mass')),
    ]),
  ];
  // Fixed widths (515 pt of A4 between the margins) so wide imperial numbers never push past the edge.
  return { table: { headerRows: 1, dontBreakRows: true, widths: ['*', 70, 40, 48, 48, 52, 50, 40], body }, layout: 'lightHorizontalLines', fontSize: 8.5, margin: [0, 0, 0, 6] };
}

function cutListTable(rows: readonly CutListRowWire[], units: UnitSystem): Content {
  const q = (v: number, d: Dimension) => formatQuantity(v, d, units).text;
  const body: TableCell[][] = [
    ['Tube size (OD × wall)', 'Material', 'Members', 'Total length', 'Mass'].map((h, i) => headerCell(h, i < 3 ? 'left' : 'right')),
    ...rows.map((r) => [
      { text: tubeSizeText(r.odMm, r.wallMm, units), fontSize: 8.5 },
      { text: humanize(r.material), fontSize: 8.5 },
      { text: pdfSafe(r.memberNames.join(', ')) + (r.namesWithoutLength.length ? `\nno length: ${pdfSafe(r.namesWithoutLength.join(', '))}` : ''), fontSize: 8.5 },
      numberCell(q(r.totalLengthMm, 'length')),
      numberCell(q(r.massKg, 'mass')),
    ]),
  ];
  return { table: { headerRows: 1, dontBreakRows: true, widths: [90, 64, '*', 60, 44], body }, layout: 'lightHorizontalLines', fontSize: 8.5, margin: [0, 0, 0, 6] };
}

function photoGrid(photos: readonly ReportPhoto[]): Content {
  const perRow = 3;
  const cells: Content[] = photos.map((p) => ({
    stack: [
      { image: `data:image/jpeg;base64,${p.thumbnail.toString('base64')}`, fit: [160, 120], margin: [0, 0, 0, 2] },
      { text: pdfSafe(p.label), bold: true, fontSize: 8 },
      ...(p.caption ? [{ text: pdfSafe(p.caption), fontSize: 8, color: COLOURS.muted }] : []),
    ],
    margin: [0, 0, 0, 8],
    unbreakable: true,
  }));
  const rows: Content[][] = [];
  for (let i = 0; i < cells.length; i += perRow) {
    const row = cells.slice(i, i + perRow);
    while (row.length < perRow) row.push({ text: '' });
    rows.push(row);
  }
  return { table: { widths: ['*', '*', '*'], body: rows }, layout: 'noBorders' };
}

const heading = (text: string): Content => ({ text, style: 'h2' });

/** A page of the tube to buy: per size, each stick's pieces and offcut, then the masses. */
export function buyingListPage(list: BuyingList, units: UnitSystem): Content[] {
  const q = (v: number, d: Dimension) => formatQuantity(v, d, units).text;
  const out: Content[] = [
    { text: 'Buying list', style: 'h2', pageBreak: 'before' },
    {
      text: `Cut lengths nested first-fit-decreasing into sticks of ${q(list.stickLengthMm, 'length')}, with ${q(list.kerfMm, 'length')} of kerf between pieces. The numbers are an aid, not a substitute for measuring the car.`,
      color: COLOURS.muted, fontSize: 8.5, margin: [0, 0, 0, 4],
    },
  ];
  if (list.groups.length === 0) out.push({ text: 'No member has a cut length yet: give members a path in the model or a length.', color: COLOURS.muted });
  for (const g of list.groups) {
    const body: TableCell[][] = [['Stick', 'Pieces (member, cut length)', 'Offcut'].map((h, i) => headerCell(h, i === 2 ? 'right' : 'left'))];
    g.sticks.forEach((st, i) => body.push([
      { text: String(i + 1), fontSize: 8.5 },
      { text: pdfSafe(st.pieces.map((p) => `${p.label} ${q(p.lengthMm, 'length')}`).join('; ')), fontSize: 8.5 },
      numberCell(q(st.offcutMm, 'length')),
    ]));
    for (const p of g.tooLong) body.push([{ text: 'longer', fontSize: 8.5, color: COLOURS.fail }, { text: pdfSafe(`${p.label} ${q(p.lengthMm, 'length')}: longer than a stick; buy a longer stick or plan a joint`), fontSize: 8.5 }, numberCell('')]);
    out.push(
      { text: pdfSafe(`${tubeSizeText(g.odMm, g.wallMm, units)} ${humanize(g.material)}: ${g.sticks.length} stick${g.sticks.length === 1 ? '' : 's'}, ${q(g.boughtMassKg, 'mass')}`), style: 'h3' },
      { table: { headerRows: 1, dontBreakRows: true, widths: [34, '*', 60], body }, layout: 'lightHorizontalLines', fontSize: 8.5, margin: [0, 0, 0, 4] },
    );
  }
  out.push({
    text: `Tube bought: ${q(list.tubeMassKg, 'mass')} (${q(list.cutTubeMassKg, 'mass')} of it in the cage). Plates: ${q(list.plateMassKg, 'mass')}${list.platesWithoutSize.length ? `, without ${list.platesWithoutSize.join(', ')} (no thickness or size given)` : ''}. Total: ${q(list.totalMassKg, 'mass')}.`,
    bold: true, margin: [0, 4, 0, 0],
  });
  return out;
}

/** The cage page: the side view across the page, top and front views below it, and the legend. */
function cageBlock(cage: NonNullable<ReportDocumentInput['cage']>): Content[] {
  const legend: Content = {
    table: {
      widths: LEGEND_MARKS.map(() => '*'),
      body: [LEGEND_MARKS.map((m) => ({ columns: [{ svg: legendSwatchSvg(m.verdict), width: 32 }, { text: m.label, fontSize: 7.5, width: '*', margin: [3, -1, 0, 0] }] }))],
    },
    layout: 'noBorders',
    margin: [0, 2, 0, 4],
  };
  const missing = cage.totalMembers - cage.drawnMembers;
  return [
    { text: 'The cage, drawn from its model', style: 'h2', pageBreak: 'before' },
    {
      text: 'Each tube is drawn to scale at its outside diameter and marked by its worst finding: the mark has its own line pattern and symbol as well as its colour.' +
        (missing > 0 ? ` ${missing} member${missing === 1 ? ' has' : 's have'} no path in the model and ${missing === 1 ? 'is' : 'are'} not drawn.` : ''),
      color: COLOURS.muted, fontSize: 8.5, margin: [0, 0, 0, 4],
    },
    legend,
    { text: 'Side view, from the left (front of the car to the left)', style: 'h3' },
    { svg: cage.svgs.side, fit: [515, 300] },
    {
      columns: [
        { width: '*', stack: [{ text: 'Top view, from above', style: 'h3' }, { svg: cage.svgs.top, fit: [250, 230] }] },
        { width: '*', stack: [{ text: 'Front view', style: 'h3' }, { svg: cage.svgs.front, fit: [250, 230] }] },
      ],
      columnGap: 14,
    },
  ];
}

/** The steward's decision: the record number, who approved it and when, waivers, and the QR to check it. */
function reviewBlock(review: ReportReview, findings: readonly Finding[], units: UnitSystem): Content[] {
  const byKey = new Map(findings.map((f) => [findingKey(f), f]));
  const day = (d: Date) => formatIsoDate(calendarDateIn(d, review.timeZone));
  const waivedCount = overallWithWaivers(findings, review.waivers.map((w) => ({ findingKey: w.findingKey, reason: w.reason, stewardId: w.stewardName }))).waivedCount;
  const out: Content[] = [
    heading('Steward review'),
    {
      columns: [
        {
          width: '*',
          stack: [
            labelValueTable([
              ['Cage record', review.recordNumber],
              ['Decision', `${approvedText(waivedCount)}, by ${review.stewardName} on ${day(review.decidedAt)}`],
              ['Valid until', day(review.expiresAt)],
              ['Status when printed', review.recordStatus],
              ...(review.note ? ([['Steward note', review.note]] as [string, string][]) : []),
              ['Check it at', review.verificationUrl],
            ]),
          ],
        },
        { width: 96, stack: [{ svg: review.qrSvg, width: 90 }, { text: 'Scan to check the record', fontSize: 7, color: COLOURS.muted, alignment: 'center' }] },
      ],
      columnGap: 12,
    },
  ];
  if (review.waivers.length) {
    out.push({ text: 'Waivers', style: 'h3' }, {
      table: {
        widths: [150, '*'],
        body: review.waivers.map((w) => {
          const f = byKey.get(w.findingKey);
          return [
            { text: f ? `${pdfSafe(f.title)}, ${subjectText(f)} (section ${pdfSafe(f.citation.section)})` : w.findingKey, bold: true },
            { text: pdfSafe(`${w.reason} (${w.stewardName})`) },
          ];
        }),
      },
      layout: 'lightHorizontalLines',
      fontSize: 8.5,
      margin: [0, 0, 0, 6],
    });
  }
  for (const i of review.inspections ?? []) {
    const when = `${day(i.inspectedAt)} ${clockTimeIn(i.inspectedAt, review.timeZone)} (${review.timeZone})`;
    const low = i.readings.filter((r) => r.belowMinimum).length;
    out.push({ text: pdfSafe(`Track inspection ${when}, seal ${i.sealNumber}, by ${i.stewardName}${low ? ` · ${low} reading${low === 1 ? '' : 's'} under the rulebook's minimum` : ''}`), style: 'h3' });
    out.push(i.readings.length
      ? {
          table: {
            widths: ['*', 90, 110],
            headerRows: 1,
            body: [
              [{ text: 'Member', bold: true }, { text: 'Wall reading', bold: true }, { text: 'Rulebook minimum', bold: true }],
              ...i.readings.map((r) => [
                { text: pdfSafe(r.memberName) },
                { text: `${quantity(r.wallMm, 'length', units)}${r.belowMinimum ? ' (under)' : ''}`, bold: r.belowMinimum, color: r.belowMinimum ? COLOURS.fail : COLOURS.ink },
                { text: r.minWallMm === null ? 'none named' : quantity(r.minWallMm, 'length', units) },
              ]),
            ],
          },
          layout: 'lightHorizontalLines',
          fontSize: 8.5,
          margin: [0, 0, 0, 6],
        }
      : { text: 'No wall readings taken.', fontSize: 8.5, color: COLOURS.muted, margin: [0, 0, 0, 6] });
  }
  return out;
}

/**
 * The first page's banner: the pre-check's verdict, or for an approved submission the steward's
 * decision with its waivers counted ("APPROVED WITH 1 WAIVER"), so a waived finding never makes the
 * page read as failing. The counts line counts waived findings apart from the ones not met.
 */
export function reportBanner(report: CheckReport, review?: ReportReview): { title: string; counts: string; note: string | null; colour: string } {
  const s = report.summary;
  const advisory = s.advisoryFail ? ` · ${s.advisoryFail} advisory not met` : '';
  if (!review) {
    return {
      title: OVERALL_WORDS[report.verdict],
      counts: `${s.pass} pass · ${s.fail} fail · ${s.needsInformation} need information · ${s.notApplicable} not applicable${advisory}`,
      note: null,
      colour: report.verdict === 'pass' ? COLOURS.pass : report.verdict === 'fail' ? COLOURS.fail : COLOURS.info,
    };
  }
  const overall = overallWithWaivers(report.findings, review.waivers.map((w) => ({ findingKey: w.findingKey, reason: w.reason, stewardId: w.stewardName })));
  const count = (v: string) => overall.findings.filter((f) => f.shown === v).length;
  const status = review.recordStatus === 'valid' ? '' : ` · record ${review.recordStatus} when printed`;
  return {
    title: `${approvedText(overall.waivedCount).toUpperCase()}${status.toUpperCase()}`,
    counts: `${s.pass} pass · ${overall.waivedCount} waived · ${count('fail')} fail · ${count('needs_information')} need information · ${s.notApplicable} not applicable${advisory}`,
    note: overall.waivedCount > 0
      ? `The pre-check found ${overall.waivedCount === 1 ? 'one finding' : `${overall.waivedCount} findings`} not met; the steward accepted ${overall.waivedCount === 1 ? 'it' : 'them'} in writing (see Waivers).`
      : null,
    colour: review.recordStatus === 'valid' ? COLOURS.pass : COLOURS.na,
  };
}

export function buildReportDocument(input: ReportDocumentInput): TDocumentDefinitions {
  const { report, units, car } = input;
  const q = (v: number, d: Dimension) => formatQuantity(v, d, units).text;
  const banner = reportBanner(report, input.review);
  // The club's calendar date, as on the public page for the code (services/verification.service.ts).
  const dateText = calendarDateIn(input.checkedAt, input.checkedTimeZone ?? 'UTC');
  const makeModel = [car?.make, car?.model].filter(Boolean).join(' ');

  const content: Content[] = [
    { text: REPORT_TITLE, style: 'title' },
    { text: pdfSafe(`${report.rulebook.title}, ${report.rulebook.edition}`), color: COLOURS.muted, margin: [0, 0, 0, 10] },
    {
      columns: [
        {
          width: '*',
          stack: [
            heading('Car'),
            labelValueTable([
              ['Car', car?.name ?? 'not from a build sheet'],
              ['Race number', car?.raceNumber ?? 'none'],
              ['Make and model', makeModel || 'not given'],
              ['Year', car?.year ? String(car.year) : 'not given'],
              ['Build sheet', input.sheetName ? `${input.sheetName}${input.revisionNumber ? `, revision ${input.revisionNumber}` : ''}` : 'none'],
              ['Builder', input.builderName ?? 'unknown'],
              ...cageRows(input.cageHistory),
            ]),
          ],
        },
        {
          width: '*',
          stack: [
            heading('Rules'),
            labelValueTable([
              ['Rulebook', report.rulebook.title],
              ['Edition', report.rulebook.edition],
              ['Publisher', report.rulebook.publisher],
              ['Effective from', report.rulebook.effectiveDate],
              ['Class', `${report.className} (${report.classId})`],
            ]),
          ],
        },
      ],
      columnGap: 16,
    },
    {
      table: {
        widths: ['*'],
        body: [[{
          stack: [
            { text: banner.title, fontSize: 24, bold: true, color: '#ffffff' },
            { text: banner.counts, color: '#ffffff', margin: [0, 2, 0, 0] },
            ...(banner.note ? [{ text: banner.note, color: '#ffffff', margin: [0, 2, 0, 0] } as Content] : []),
          ],
          fillColor: banner.colour,
          margin: [10, 8, 10, 8],
        }]],
      },
      layout: 'noBorders',
      margin: [0, 6, 0, 6],
    },
    labelValueTable([
      ['Verification code', input.verificationCode],
      ...(input.lookUpUrl
        ? ([['Look it up at', `${input.lookUpUrl}: the page says this is a pre-check made on ${dateText}, with its result, and not a cage record.`]] as [string, string][])
        : []),
      ['Checked on', dateText],
      ['Units', units === 'metric' ? 'metric (mm, kg)' : 'imperial (in, lb)'],
    ]),
    ...(input.review ? reviewBlock(input.review, report.findings, input.units) : []),
    { text: SAFETY_CAUTION, bold: true, margin: [0, 2, 0, 2] },
    { text: pdfSafe(report.disclaimer), color: COLOURS.muted, fontSize: 8.5, margin: [0, 0, 0, 10] },
  ];
  const waived = new Map((input.review?.waivers ?? []).map((w) => [w.findingKey, { reason: w.reason, stewardName: w.stewardName }]));

  // Waived findings are listed with their reasons under Waivers; here only what still is not met.
  const notMet = report.findings.filter((f) => (f.verdict === 'fail' || (f.verdict === 'needs_information' && f.severity === 'mandatory')) && !waived.has(findingKey(f)));
  if (notMet.length) {
    content.push(heading('Not met yet'), {
      table: {
        widths: [100, '*', 'auto'],
        body: notMet.map((f) => [
          { text: VERDICT_WORDS[f.verdict], bold: true, color: VERDICT_COLOURS[f.verdict] },
          { text: `${pdfSafe(f.title)}, ${subjectText(f)}` },
          { text: `Section ${pdfSafe(f.citation.section)}`, alignment: 'right' as const },
        ]),
      },
      layout: 'lightHorizontalLines',
      fontSize: 8.5,
      margin: [0, 0, 0, 6],
    });
  }

  if (report.measureNext.length) {
    content.push(heading('Measure next'), {
      ul: report.measureNext.map((m) => {
        const who = m.memberNames ?? m.memberIds;
        return pdfSafe(`${m.label}${who.length ? ` (${who.join(', ')})` : ''}`);
      }),
      margin: [0, 0, 0, 8],
    });
  }

  // The first page is the summary a steward reads first; the drawing, then the findings, follow.
  if (input.cage && input.cage.drawnMembers > 0) content.push(...cageBlock(input.cage));
  content.push({ text: 'Findings', style: 'h2', pageBreak: 'before' });
  if (report.findings.length === 0) content.push({ text: 'This ruleset has no requirements for this class.', color: COLOURS.muted });
  for (const group of findingsByArea(report.findings)) {
    content.push({ text: group.title, style: 'h3' });
    for (const reqFindings of findingsByRequirement(group.findings)) content.push(requirementBlock(reqFindings, units, waived));
  }

  content.push(heading('Tube data'));
  if (input.tubeData.members.length === 0) content.push({ text: 'The specification lists no members.', color: COLOURS.muted });
  else {
    content.push(tubeTable(input.tubeData, units));
    const mass = q(input.tubeData.estimatedTubeMassKg, 'mass');
    content.push({
      text: input.tubeData.massComplete
        ? `Estimated tube mass of the cage: ${mass}.`
        : `Estimated tube mass of the cage: ${mass}, without ${pdfSafe(input.tubeData.namesWithoutLength.join(', '))} (no length given).`,
      margin: [0, 0, 0, 4],
    });
    if (input.tubeData.members.some((m) => m.densityAssumed)) {
      content.push({ text: 'Masses assume steel at 7.85 g/cm³ where no material is given.', color: COLOURS.muted, fontSize: 8.5 });
    }
    content.push({ text: 'Cut list', style: 'h3' }, cutListTable(input.tubeData.cutList, units));
  }

  if (input.buyingList) content.push(...buyingListPage(input.buyingList, units));

  content.push(heading('Photos'));
  content.push(input.photos.length ? photoGrid(input.photos) : { text: 'No photos were added to this build sheet.', color: COLOURS.muted });

  return {
    info: { title: `${REPORT_TITLE} ${input.verificationCode}`, author: 'Cagewright', subject: pdfSafe(report.rulebook.title), creator: 'Cagewright' },
    pageSize: 'A4',
    pageMargins: [40, 48, 40, 62],
    header: (page: number) =>
      page === 1
        ? { text: '' }
        : { text: `${REPORT_TITLE} · ${pdfSafe(car?.name ?? '')} · ${input.verificationCode}`, fontSize: 8, color: COLOURS.muted, margin: [40, 22, 40, 0] },
    footer: (page: number, pages: number) => ({
      columns: [
        { text: SAFETY_CAUTION, fontSize: 7.5, color: COLOURS.muted, width: '*' },
        { text: `Page ${page} of ${pages}`, fontSize: 7.5, color: COLOURS.muted, width: 60, alignment: 'right' },
      ],
      margin: [40, 14, 40, 0],
    }),
    content,
    styles: {
      title: { fontSize: 20, bold: true, color: COLOURS.ink },
      h2: { fontSize: 12.5, bold: true, color: COLOURS.ink, margin: [0, 8, 0, 4] },
      h3: { fontSize: 10.5, bold: true, color: COLOURS.ink, margin: [0, 6, 0, 3] },
    },
    defaultStyle: { color: COLOURS.ink, lineHeight: 1.15 },
  };
}

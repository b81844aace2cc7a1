// buildReportDocument: the pre-check report as a pdfmake definition, checked as data (no rendering):
// the words it must carry, the caution on every page, values in the reader's units through
// formatQuantity (F-UNIT-1: 1 in = 25.4 mm exactly), and no character Noto Sans cannot draw.
import { describe, expect, it } from 'vitest';
import type { Content } from 'pdfmake/interfaces';
import type { Finding, MeasuredValue, RequiredValue } from '@backend/contracts/report';
import {
  buildReportDocument, findingsByArea, findingsByRequirement, measuredText, pdfSafe, requiredText, REPORT_TITLE, SAFETY_CAUTION, tubeSizeText,
} from '@backend/pdf/report-document';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { compileRuleset, evaluateSpecification, validateRulesetDocument } from '@backend/domain';
import { tubeDataFor } from '@backend/services/garage/tube-data';
import { sampleReportInput, sampleSpecification } from '../../bench/pdf';

/** Every text a definition puts on the page, in document order (not colours, styles or widths). */
function textsOf(node: unknown, out: string[] = [], isText = false): string[] {
  if (typeof node === 'string') {
    if (isText) out.push(node);
  } else if (Array.isArray(node)) node.forEach((n) => textsOf(n, out, isText));
  else if (node && typeof node === 'object') {
    for (const [k, v] of Object.entries(node)) if (k !== 'image') textsOf(v, out, k === 'text' || k === 'ul' || (isText && k !== 'style' && k !== 'color'));
  }
  return out;
}

describe('pdfSafe', () => {
  it.each([
    ['CLR ≥ 3 × OD', 'CLR at least 3 × OD'],
    ['wall ≤0.120 in', 'wall at most 0.120 in'],
    ['1.5 in → 38.1 mm', '1.5 in to 38.1 mm'],
    ['in mild_steel for chromoly_4130', 'in mild steel for chromoly 4130'],
    ['plain text stays', 'plain text stays'],
  ])('%s → %s', (input, output) => expect(pdfSafe(input)).toBe(output));
});

describe('values in words', () => {
  const measured: MeasuredValue = { fact: 'member.wallMm', label: 'wall thickness', value: 2.413, dimension: 'length' };
  const required = (operator: RequiredValue['operator'], value: RequiredValue['value'], dimension: RequiredValue['dimension'] = 'length'): RequiredValue =>
    ({ fact: 'member.wallMm', label: 'wall thickness', operator, value, dimension });

  it.each<[string, string, 'imperial' | 'metric']>([
    ['measured in inches', 'wall thickness: 0.095 in', 'imperial'],
    ['measured in millimetres', 'wall thickness: 2.41 mm', 'metric'],
  ])('%s', (_l, text, units) => expect(measuredText(measured, units)).toBe(text));

  it.each<[RequiredValue, string]>([
    [required('atLeast', 2.413), 'wall thickness: at least 0.095 in'],
    [required('atMost', 3.048), 'wall thickness: at most 0.120 in'],
    [required('oneOf', ['dom', 'cds'], null), 'wall thickness: one of DOM, CDS'],
    [required('equals', true, null), 'wall thickness: exactly yes'],
    [required('noneOf', ['chromoly_4130'], null), 'wall thickness: none of 4130 chromoly'],
  ])('required %j reads "%s"', (r, text) => expect(requiredText(r, 'imperial')).toBe(text));

  it.each<[number, number, 'imperial' | 'metric', string]>([
    [44.45, 2.413, 'imperial', '1.750 × 0.095 in'],
    [45, 2.5, 'metric', '45.0 × 2.50 mm'],
  ])('tube %d × %d in %s is %s', (od, wall, units, text) => expect(tubeSizeText(od, wall, units)).toBe(text));
});

describe('grouping findings', () => {
  const f = (requirementId: string, area: Finding['area']) => ({ requirementId, area }) as Finding;
  it('orders areas as the ruleset format does and leaves empty ones out', () => {
    const groups = findingsByArea([f('a', 'welding'), f('b', 'tubes'), f('c', 'welding'), f('d', 'material')]);
    expect(groups.map((g) => [g.title, g.findings.map((x) => x.requirementId)])).toEqual([['Tubes', ['b']], ['Welding', ['a', 'c']], ['Material', ['d']]]);
  });
  it('keeps one requirement’s subjects together in report order', () => {
    expect(findingsByRequirement([f('a', 'tubes'), f('b', 'tubes'), f('a', 'tubes')]).map((g) => g.map((x) => x.requirementId))).toEqual([['a', 'a'], ['b']]);
  });
});

describe('buildReportDocument', () => {
  it('carries the title, car, rules, verdict, every finding’s section, tube data, photos and the verification code', async () => {
    const input = await sampleReportInput('imperial', 2);
    const doc = buildReportDocument(input);
    const text = textsOf(doc.content).join('\n');
    for (const expected of [REPORT_TITLE, 'Grey Saloon', '47', 'Varden Corsair 1.8', '1994', 'Tarnwick Vale MC Cage Regulations', '2027', 'Tarnwick Vale Motor Club',
      'DOES NOT PASS THE PRE-CHECK', input.verificationCode, '2026-12-01', 'Cut list', 'Seen from the passenger door', SAFETY_CAUTION]) {
      expect(text).toContain(expected);
    }
    for (const finding of input.report.findings) expect(text).toContain(`Section ${finding.citation.section}`);
    // The thin door bar: 1.25 × 0.065 in (F-UNIT-1) shows in the tube table and the cut list.
    expect(text.match(/1\.250 × 0\.065 in/g)?.length).toBeGreaterThanOrEqual(2);
    const images = JSON.stringify(doc.content).match(/data:image\/jpeg;base64,/g);
    expect(images).toHaveLength(2);
  });

  it('puts the safety caution and the page number in every page’s footer', async () => {
    const doc = buildReportDocument(await sampleReportInput('metric', 0));
    const footer = doc.footer as (page: number, pages: number) => Content;
    for (const page of [1, 2, 3]) expect(textsOf(footer(page, 3))).toEqual([SAFETY_CAUTION, `Page ${page} of 3`]);
  });

  it('writes numbers in the reader’s units and nothing Noto Sans cannot draw', async () => {
    const metric = textsOf(buildReportDocument(await sampleReportInput('metric', 0)).content).join('\n');
    expect(metric).toContain('44.5 × 2.41 mm');
    expect(metric).toContain('outside diameter: 44.5 mm');
    // Reasons and explanations are the engine's and the rulebook's own words; the values we format are not in inches.
    expect(metric).not.toMatch(/(outside diameter|wall thickness): [\d.]+ in\b/);
    const imperial = textsOf(buildReportDocument(await sampleReportInput('imperial', 0)).content).join('\n');
    expect(imperial).toContain('1.750 × 0.095 in');
    expect(`${metric}\n${imperial}`).not.toMatch(/[≥≤→≠✓✗]/);
  });

  it.each([
    ['pass', 'PASSES THE PRE-CHECK'],
    ['needs_information', 'NEEDS MORE INFORMATION'],
  ] as const)('states a %s verdict in large type', async (verdict, words) => {
    const input = await sampleReportInput('imperial', 0);
    const doc = buildReportDocument({ ...input, report: { ...input.report, verdict } });
    expect(JSON.stringify(doc.content)).toContain(JSON.stringify({ text: words, fontSize: 24, bold: true, color: '#ffffff' }).slice(0, -1));
  });

  it('says so when there are no members, no photos and no car', async () => {
    const input = await sampleReportInput('imperial', 0);
    const doc = buildReportDocument({ ...input, car: null, tubeData: { members: [], cutList: [], estimatedTubeMassKg: 0, massComplete: true, membersWithoutLength: [], namesWithoutLength: [] } });
    const text = textsOf(doc.content).join('\n');
    expect(text).toContain('The specification lists no members.');
    expect(text).toContain('No photos were added to this build sheet.');
    expect(text).toContain('not from a build sheet');
  });
});

describe('the cage’s approval and certificate on the report', () => {
  it('shows the approval and build dates and the maker’s certificate the sheet gives, and nothing when it gives none', async () => {
    const input = await sampleReportInput('metric', 0);
    const withCage = textsOf(buildReportDocument({ ...input, cageHistory: { approvedOn: '1998-05-14', builtOn: '1998-03-01', certificate: { issuer: 'Example Cage Works', number: 'ECW-0457' } } }).content).join('\n');
    for (const expected of ['Cage approved on', '14 May 1998', 'Cage built on', '1 Mar 1998', "Maker's certificate", 'ECW-0457, Example Cage Works']) expect(withCage).toContain(expected);
    const without = textsOf(buildReportDocument(input).content).join('\n');
    expect(without).not.toContain("Maker's certificate");
    expect(without).not.toContain('Cage approved on');
  });
});

describe('an approved submission’s report', () => {
  const review = (waivers: { findingKey: string; reason: string; stewardName: string }[], recordStatus = 'valid', timeZone = 'Europe/London') => ({
    recordNumber: 'TVMC-2026-0007', recordStatus, stewardName: 'Imogen Feld', decidedAt: new Date('2026-12-02T10:00:00Z'),
    expiresAt: new Date('2027-12-02T10:00:00Z'), timeZone, note: null, waivers, verificationUrl: 'https://cagewright.example/verify/X', qrSvg: '<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"/>',
  });

  it('reads "approved with 1 waiver" in the banner and the summary, and the finding as waived with its reason', async () => {
    const input = await sampleReportInput('imperial', 0);
    // The sample's run with one mandatory finding failing and everything else met.
    const failing = input.report.findings.find((f) => f.severity === 'mandatory' && f.member)!;
    const findings = input.report.findings.map((f): Finding => (f === failing ? { ...f, verdict: 'fail' } : f.verdict === 'not_applicable' ? f : { ...f, verdict: 'pass' }));
    const count = (v: Finding['verdict']) => findings.filter((f) => f.verdict === v).length;
    const summary = { pass: count('pass'), fail: 1, needsInformation: 0, notApplicable: count('not_applicable'), advisoryFail: 0 };
    const report = { ...input.report, verdict: 'fail' as const, findings, summary, measureNext: [] };
    const key = `${failing.requirementId}@member:${failing.member!.id}`;
    const text = textsOf(buildReportDocument({ ...input, report, review: review([{ findingKey: key, reason: 'Sonic reading 0.095 in on the car.', stewardName: 'Imogen Feld' }]) }).content).join('\n');
    expect(text).toContain('APPROVED WITH 1 WAIVER');
    expect(text).not.toContain('DOES NOT PASS THE PRE-CHECK');
    expect(text).toContain(`${summary.pass} pass · 1 waived · 0 fail · 0 need information · ${summary.notApplicable} not applicable`);
    expect(text).toContain('Approved with 1 waiver, by Imogen Feld on 2 Dec 2026');
    // Nothing is left "not met": the waived finding is under Waivers with its reason, and reads waived below.
    expect(text).not.toContain('Not met yet');
    expect(text).toContain('Waived by Imogen Feld: ');
    expect(text).toContain('Sonic reading 0.095 in on the car.');
    // Without the review the same run reads as it is: not passed.
    expect(textsOf(buildReportDocument({ ...input, report }).content).join('\n')).toContain('DOES NOT PASS THE PRE-CHECK');
  });

  it('prints the dates in the club’s time zone: a record expiring at 14:00 UTC is valid until the next day in Auckland', async () => {
    const input = await sampleReportInput('imperial', 0);
    const late = {
      ...review([], 'valid', 'Pacific/Auckland'), decidedAt: new Date('2026-12-02T14:00:00Z'), expiresAt: new Date('2027-12-02T14:00:00Z'),
      inspections: [{ inspectedAt: new Date('2026-12-02T23:30:00Z'), sealNumber: 'S-1', stewardName: 'Imogen Feld', readings: [] }],
    };
    const text = textsOf(buildReportDocument({ ...input, review: late }).content).join('\n');
    // Pacific/Auckland is UTC+13 in December (summer time): 14:00 UTC on 2 Dec is 03:00 on 3 Dec there.
    expect(text).toContain('by Imogen Feld on 3 Dec 2026');
    expect(text).toMatch(/Valid until\s*3 Dec 2027/);
    expect(text).toContain('Track inspection 3 Dec 2026 12:30 (Pacific/Auckland)');
    // The same record for a London club: the UTC dates.
    expect(textsOf(buildReportDocument({ ...input, review: { ...late, timeZone: 'Europe/London' } }).content).join('\n')).toMatch(/Valid until\s*2 Dec 2027/);
  });

  it('says "approved" without waivers, and names a record that is no longer valid', async () => {
    const input = await sampleReportInput('imperial', 0);
    expect(textsOf(buildReportDocument({ ...input, review: review([]) }).content).join('\n')).toContain('APPROVED');
    expect(textsOf(buildReportDocument({ ...input, review: review([], 'revoked') }).content).join('\n')).toContain('APPROVED · RECORD REVOKED WHEN PRINTED');
  });
});

describe('members by the builder’s names', () => {
  it('findings, "measure next", tube data and the cut list name a member as the builder does, never by its id', async () => {
    const spec = sampleSpecification();
    const labels: Record<string, string> = { 'db-r1': 'door bar right upper', dash: 'dash bar', 'rb-l': 'backstay left' };
    for (const m of spec.members) if (labels[m.id]) m.label = labels[m.id];
    const validation = validateRulesetDocument(JSON.parse(readFileSync(fileURLToPath(new URL('../../../rulesets/tarnwick-vale-mc-cage-regulations-2027.json', import.meta.url)), 'utf8')));
    if (!validation.ok) throw new Error('demo ruleset invalid');
    const report = await evaluateSpecification(compileRuleset(validation.document), spec.vehicle.classId, spec, { unitSystem: 'imperial' });
    // The thin door bar fails (§ C4.3.1) and the dash bar has no length: both named as labelled.
    expect(report.findings.some((f) => f.verdict === 'fail' && f.member?.name === 'door bar right upper')).toBe(true);
    const input = await sampleReportInput('imperial', 0);
    const doc = buildReportDocument({ ...input, report, tubeData: tubeDataFor(spec) });
    const text = textsOf(doc.content).join('\n');
    expect(text).toContain('door bar right upper');
    expect(text).toContain('backstay left\nrear brace (backstay)');
    expect(text).toContain('without dash bar (no length given)');
    for (const id of Object.keys(labels)) expect(text).not.toContain(`"${id}"`);
    expect(text).not.toMatch(/\b(db-r1|rb-l)\b/);
  });
});

// PDF report benchmark: the median time to build and render one pre-check report (a full cage on the
// demo club's rulebook, 12 members, 6 photo thumbnails; about four pages). Target: under 150 ms.
// `sampleReportInput` is also what the report-document tests and the page previews render.
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import type { Specification } from '../../backend/src/contracts/specification';
import { compileRuleset, evaluateSpecification, validateRulesetDocument } from '../../backend/src/domain';
import { inToMm, lbToKg, type UnitSystem } from '../../backend/src/domain/units';
import { renderPdf } from '../../backend/src/pdf/pdf-engine';
import { buildReportDocument, type ReportDocumentInput, type ReportPhoto } from '../../backend/src/pdf/report-document';
import { tubeDataFor } from '../../backend/src/services/garage/tube-data';

const demoRuleset = fileURLToPath(new URL('../../rulesets/tarnwick-vale-mc-cage-regulations-2027.json', import.meta.url));

const tube = (od: number, wall: number) => ({ odMm: inToMm(od), wallMm: inToMm(wall) });

/** A full cage for the demo club's saloon class, with one thin door bar so the report has a fail. */
export function sampleSpecification(): Specification {
  const hoop = { ...tube(1.75, 0.095), material: 'mild_steel' as const, process: 'dom' as const };
  return {
    vehicle: { classId: 'club-saloon', weightWithDriverKg: lbToKg(2650), chassis: 'unibody', cockpit: 'closed', fuel: 'petrol' },
    members: [
      { id: 'mh', kind: 'main_hoop', label: 'Main hoop', ...hoop, lengthMm: 3350, continuousPiece: true, bends: [{ clrMm: inToMm(5.5) }, { clrMm: inToMm(5.5) }] },
      { id: 'fh', kind: 'front_hoop', ...hoop, lengthMm: 3900, bends: [{ clrMm: inToMm(5.5) }] },
      { id: 'rb-l', kind: 'rear_brace', ...hoop, lengthMm: 1150 },
      { id: 'rb-r', kind: 'rear_brace', ...hoop, lengthMm: 1150 },
      { id: 'hb', kind: 'harness_bar', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom', lengthMm: 1180 },
      { id: 'db-l1', kind: 'door_bar', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom', lengthMm: 1020 },
      { id: 'db-l2', kind: 'door_bar', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom', lengthMm: 1020 },
      { id: 'db-r1', kind: 'door_bar', ...tube(1.25, 0.065), material: 'mild_steel', process: 'erw', lengthMm: 1020 },
      { id: 'dg', kind: 'diagonal', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom', lengthMm: 1450 },
      { id: 'rf', kind: 'roof_bar', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom', lengthMm: 1300 },
      { id: 'dash', kind: 'dash_bar', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom' },
      { id: 'ap-l', kind: 'a_pillar', ...tube(1.5, 0.095), material: 'mild_steel', process: 'dom', lengthMm: 900 },
    ],
    geometry: { rearBraceAttachBelowTopMm: inToMm(4), rearBraceAngleFromVerticalDeg: 38, helmetBelowHoopLineMm: inToMm(2), mainHoopInsideWidthMm: 1120, harnessBarBelowShouldersMm: 40 },
    plates: [
      { id: 'p-mh-l', location: 'main_hoop_foot', memberId: 'mh', thicknessMm: inToMm(0.125), sidesMm: [inToMm(6), inToMm(6)], fixing: 'welded' },
      { id: 'p-mh-r', location: 'main_hoop_foot', memberId: 'mh', thicknessMm: inToMm(0.125), sidesMm: [inToMm(6), inToMm(6)], fixing: 'welded' },
    ],
    inspectionHoles: [{ memberId: 'mh', diameterMm: inToMm(0.1875), distanceFromWeldOrBendMm: 150 }],
    padding: { nearHelmet: true, standard: 'sfi_45_1' },
    welding: { process: 'mig' },
  };
}

async function samplePhotos(count: number): Promise<ReportPhoto[]> {
  const labels = ['main hoop "mh"', 'mounting', 'welding', 'door bar "db-r1"', 'padding', 'general'];
  const out: ReportPhoto[] = [];
  for (let i = 0; i < count; i++) {
    const thumbnail = await sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 60 + i * 30, g: 90, b: 120 } } }).jpeg({ quality: 78 }).toBuffer();
    out.push({ thumbnail, label: labels[i % labels.length]!, caption: i % 2 ? 'Left foot, plate welded all round before paint' : 'Seen from the passenger door' });
  }
  return out;
}

export async function sampleReportInput(units: UnitSystem = 'imperial', photoCount = 6): Promise<ReportDocumentInput> {
  const validation = validateRulesetDocument(JSON.parse(readFileSync(demoRuleset, 'utf8')));
  if (!validation.ok) throw new Error('The demo ruleset does not validate');
  const spec = sampleSpecification();
  const report = await evaluateSpecification(compileRuleset(validation.document), spec.vehicle.classId, spec, { unitSystem: units });
  return {
    report, units,
    car: { name: 'Grey Saloon', raceNumber: '47', make: 'Varden', model: 'Corsair 1.8', year: 1994 },
    builderName: 'Robin Ashcombe', sheetName: 'Full cage 2027', revisionNumber: 3,
    verificationCode: 'K7QM2X9PDR4TV8WZ3HNB6CJE', checkedAt: new Date('2026-12-01T10:15:00Z'),
    tubeData: tubeDataFor(spec), photos: await samplePhotos(photoCount),
  };
}

export async function runPdfBench(runs = 25): Promise<{ medianMs: number }> {
  const input = await sampleReportInput();
  await renderPdf(buildReportDocument(input)); // the first render in a process loads fonts
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await renderPdf(buildReportDocument(input));
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return { medianMs: Math.round(times[Math.floor(times.length / 2)]! * 10) / 10 };
}

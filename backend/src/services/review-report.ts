// The PDF report of an approved submission: the pre-check report of its check run, plus the steward's
// decision, the waivers (each finding marked waived, with its reason), the cage record's number and
// a QR code of the public verification link, and the record's track inspections with their readings.
import QRCode from 'qrcode';
import type { DataSource } from 'typeorm';
import { recordStatus } from '../domain/review/cage-record';
import type { UnitSystem } from '../domain/units';
import { CageRecord, CageRecordInspection, Club, User } from '../entities';
import { isBelowMinimum } from '../domain/review/inspection';
import { ConflictError } from '../errors';
import type { ReportService } from './reports.service';
import { verificationUrl } from './cage-records.service';
import { submissionFor } from './review-access';

export async function approvedSubmissionPdf(
  ds: DataSource, deps: { reports: ReportService; publicUrl: string }, submissionId: string, userId: string, units?: UnitSystem,
): Promise<{ pdf: Buffer; recordNumber: string }> {
  const { row } = await submissionFor(ds.manager, submissionId, userId);
  const record = await ds.getRepository(CageRecord).findOneBy({ submissionId: row.id });
  if (row.state !== 'approved' || !record)
    throw new ConflictError('Only an approved submission has a report with the steward’s decision. Download the check run’s pre-check report instead.');
  const name = async (id: string | null) => (id ? ((await ds.getRepository(User).findOneBy({ id }))?.displayName ?? 'a steward') : 'a steward');
  const url = verificationUrl(deps.publicUrl, record.verificationCode);
  const inspections = await ds.getRepository(CageRecordInspection).find({ where: { recordId: record.id }, order: { inspectedAt: 'DESC', createdAt: 'DESC' } });
  const { pdf } = await deps.reports.pdf(row.checkRunId, userId, units, {
    recordNumber: record.number,
    recordStatus: recordStatus({ ...record }, new Date()),
    stewardName: await name(record.stewardId),
    decidedAt: row.decidedAt ?? record.issuedAt,
    expiresAt: record.expiresAt,
    timeZone: (await ds.getRepository(Club).findOneByOrFail({ id: record.clubId })).timeZone,
    note: row.decisionNote,
    waivers: await Promise.all(row.waivers.map(async (w) => ({ findingKey: w.findingKey, reason: w.reason, stewardName: await name(w.stewardId) }))),
    verificationUrl: url,
    qrSvg: await QRCode.toString(url, { type: 'svg', margin: 0, errorCorrectionLevel: 'M' }),
    inspections: await Promise.all(inspections.map(async (i) => ({
      inspectedAt: i.inspectedAt, sealNumber: i.sealNumber, stewardName: await name(i.stewardId),
      readings: i.readings.map((r) => ({ memberName: r.memberName, wallMm: r.wallMm, minWallMm: r.minWallMm, belowMinimum: isBelowMinimum(r.wallMm, r.minWallMm) })),
    }))),
  });
  return { pdf, recordNumber: record.number };
}

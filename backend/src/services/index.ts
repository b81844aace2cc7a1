// Builds every service from the DataSource and configuration. Services never see req/res.
import type { DataSource } from 'typeorm';
import { createAccessReader, type AccessReader } from './access';
import { createAccountService, type AccountService } from './accounts.service';
import { createMemberService, type MemberService } from './members.service';
import { createPasswordResetService, type PasswordResetService } from './password-resets.service';
import { createCheckService, type CheckService, type CheckServiceOptions } from './checks.service';
import { createRulesetService, type RulesetService } from './rulesets.service';
import { createAuditService, type AuditService } from './audit.service';
import { createMailboxService, createMailService, type MailboxService, type MailService } from './mail';
import { createJobProgressReader, createJobProgressStore, type JobProgressReader } from './jobs';
import { createBuildSheetService, type BuildSheetService } from './build-sheets.service';
import { createGarageService, type GarageService } from './garage.service';
import { createPhotoService, type PhotoService } from './photos.service';
import { LocalDiskPhotoStorage, type PhotoStorage, type PhotoStorageSettings } from './photos/photo-storage';
import { createPhotoStorage } from './photos/storage';
import { createReportService, type ReportService } from './reports.service';
import { createReviewService, type ReviewService } from './review.service';
import { createReviewReader, type ReviewReader } from './review-detail';
import { createCageRecordService, type CageRecordService } from './cage-records.service';
import { createRecordBookService, type RecordBookService } from './record-book.service';
import { createVerificationService, type VerificationService } from './verification.service';
import { createRulebookAdminService, type RulebookAdminService } from './rulebook-admin.service';
import { createTubeStockService, type TubeStockService } from './tube-stock.service';
import { createTubeChoiceService, type TubeChoiceService } from './tube-choice.service';
import { createJournalService, type JournalService } from './journal.service';
import { createFabricationService, type FabricationService } from './fabrication.service';
import { createFabricationSettingsService } from './fabrication-settings.service';
import { createClubSettingsService, type ClubSettingsService } from './club-settings.service';
import { createSheetEditionService, type SheetEditionService } from './sheet-editions.service';
import { createSideBySideService, type SideBySideService } from './side-by-side.service';
import { createCarTransferService, type CarTransferService } from './car-transfers.service';

export interface Services {
  /** The access policy's look-ups for the route guards (roles in a club, roles anywhere). */
  access: AccessReader;
  accounts: AccountService;
  members: MemberService;
  passwordResets: PasswordResetService;
  rulesets: RulesetService;
  checks: CheckService;
  audit: AuditService;
  mail: MailService;
  mailbox: MailboxService;
  jobProgress: JobProgressReader;
  garage: GarageService;
  buildSheets: BuildSheetService;
  photos: PhotoService;
  reports: ReportService;
  review: ReviewService;
  reviewReader: ReviewReader;
  cageRecords: CageRecordService;
  /** The club's records page, track inspections and expiry reminders. */
  recordBook: RecordBookService;
  verification: VerificationService;
  rulebookAdmin: RulebookAdminService;
  tubeStock: TubeStockService;
  tubeChoice: TubeChoiceService;
  journal: JournalService;
  fabrication: FabricationService;
  clubSettings: ClubSettingsService;
  sheetEditions: SheetEditionService;
  sideBySide: SideBySideService;
  carTransfers: CarTransferService;
}

export function createServices(
  ds: DataSource,
  // Photos go to `photoStorage`, else to the store `storage` describes (config.photoStorage), else to
  // local disk under `uploadDir` (config's UPLOAD_DIR).
  // Bulk re-checks (publish, impact) use `recheckWorkers` threads (config's RECHECK_WORKERS; 0: the
  // calling thread; default one per core) and pages of `recheckBatchSize` sheets.
  // `checks` sets the check pools outright (tests and the bench).
  // `now` is the clock that decides the clubs' "today" (editions in force or scheduled); tests pass their own.
  options: {
    publicUrl: string;
    uploadDir?: string;
    photoStorage?: PhotoStorage;
    storage?: PhotoStorageSettings;
    recheckWorkers?: number;
    recheckBatchSize?: number;
    checks?: CheckServiceOptions;
    now?: () => Date;
  },
): Services {
  const now = options.now ?? (() => new Date());
  const rulesets = createRulesetService(ds);
  const audit = createAuditService(ds);
  const mail = createMailService(ds);
  const members = createMemberService(ds, { publicUrl: options.publicUrl, audit, mail });
  const checks = createCheckService(ds, rulesets, { ...(options.recheckWorkers !== undefined ? { recheckWorkers: options.recheckWorkers } : {}), ...options.checks });
  const buildSheets = createBuildSheetService(ds);
  // Sheet photos and journal photos share one store (their keys differ: sheets/… and journal/…).
  const photoStorage =
    options.photoStorage ?? (options.storage ? createPhotoStorage(options.storage) : new LocalDiskPhotoStorage(options.uploadDir ?? '.data/uploads'));
  const photos = createPhotoService(ds, photoStorage);
  const cageRecords = createCageRecordService(ds, { mail, audit, publicUrl: options.publicUrl });
  const fabricationSettings = createFabricationSettingsService(ds);
  const reports = createReportService(ds, { checks, sheets: buildSheets, photos, fabricationSettings, publicUrl: options.publicUrl });
  const tubeStock = createTubeStockService(ds, { audit });
  const clubSettings = createClubSettingsService(ds, { audit, now });
  return {
    access: createAccessReader(ds),
    accounts: createAccountService(ds),
    members,
    passwordResets: createPasswordResetService(ds, { mail, publicUrl: options.publicUrl }),
    rulesets,
    checks,
    audit,
    mail,
    mailbox: createMailboxService(ds),
    jobProgress: createJobProgressReader(createJobProgressStore((text, values) => ds.query(text, values)), ds),
    garage: createGarageService(ds, { now }),
    buildSheets,
    photos,
    reports,
    review: createReviewService(ds, { mail, audit, publicUrl: options.publicUrl, records: cageRecords }),
    reviewReader: createReviewReader(ds, { records: cageRecords, reports, publicUrl: options.publicUrl }),
    cageRecords,
    recordBook: createRecordBookService(ds, { audit, mail, publicUrl: options.publicUrl, now }),
    verification: createVerificationService(ds),
    rulebookAdmin: createRulebookAdminService(ds, { rulesets, audit, clubSettings, now, evaluator: checks.bulk, ...(options.recheckBatchSize ? { batchSize: options.recheckBatchSize } : {}) }),
    tubeStock,
    tubeChoice: createTubeChoiceService(ds, { rulesets, stock: tubeStock, buildSheets }),
    journal: createJournalService(ds, { storage: photoStorage, audit }),
    fabrication: createFabricationService(ds, { buildSheets, settings: fabricationSettings }),
    clubSettings,
    sheetEditions: createSheetEditionService(ds, { rulesets, buildSheets }),
    sideBySide: createSideBySideService(ds, { checks }),
    carTransfers: createCarTransferService(ds, { audit, mail, publicUrl: options.publicUrl }),
  };
}

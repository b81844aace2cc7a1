// Every entity, listed explicitly (no globs: tsx, tsc and vitest must all see the same set).
import { Club } from './club.entity';
import { Invitation } from './invitation.entity';
import { Membership } from './membership.entity';
import { User } from './user.entity';
import { Rulebook } from './rulebook.entity';
import { RulesetVersion } from './ruleset-version.entity';
import { CheckRun } from './check-run.entity';
import { Car } from './car.entity';
import { BuildSheet } from './build-sheet.entity';
import { BuildSheetRevision } from './build-sheet-revision.entity';
import { Photo } from './photo.entity';
import { OutboxMessage } from './outbox-message.entity';
import { AuditEntry } from './audit-entry.entity';
import { Submission } from './submission.entity';
import { SubmissionEvent } from './submission-event.entity';
import { FindingAnnotation } from './finding-annotation.entity';
import { CageRecord, CageRecordSequence, ClubRecordSettings, StewardMailOptIn } from './cage-record.entity';
import { ClubStockSeed, StockTube } from './stock-tube.entity';
import { JournalEntry, JournalPhoto } from './journal.entity';
import { HoopLegMeasurement } from './hoop-leg-measurement.entity';
import { PasswordReset } from './password-reset.entity';
import { CageRecordInspection } from './cage-record-inspection.entity';
import { CarTransfer } from './car-transfer.entity';

export { Club, Invitation, Membership, User, PasswordReset };
export { clubRoles, type ClubRole } from './membership.entity';
export { unitSystems, type UnitSystem } from './user.entity';
export { Rulebook, RulesetVersion, CheckRun };
export { allowedStatusMoves, immutableRowSqlState, rulesetStatuses, type RulesetStatus } from './ruleset-version.entity';
export { overallVerdicts, type OverallVerdict } from './check-run.entity';
export { Car, BuildSheet, BuildSheetRevision, Photo };
export type { ChassisType } from './car.entity';
export { OutboxMessage, AuditEntry };
export { outboxStatuses, type OutboxStatus } from './outbox-message.entity';
export { Submission, SubmissionEvent, FindingAnnotation, CageRecord, CageRecordSequence, ClubRecordSettings, StewardMailOptIn };
export { StockTube, ClubStockSeed, JournalEntry, JournalPhoto, HoopLegMeasurement, CageRecordInspection };
export type { StoredInspectionReading } from './cage-record-inspection.entity';
export type { MeasuredLeg } from './hoop-leg-measurement.entity';
export { stockMaterials, stockProcesses } from './stock-tube.entity';
export { CarTransfer };
export { carTransferStates, type CarTransferState } from './car-transfer.entity';

export const entities = [User, Club, Membership, Invitation, Rulebook, RulesetVersion, CheckRun, Car, BuildSheet, BuildSheetRevision, Photo, OutboxMessage, AuditEntry,
  Submission, SubmissionEvent, FindingAnnotation, CageRecord, CageRecordSequence, ClubRecordSettings, StewardMailOptIn,
  StockTube, ClubStockSeed, JournalEntry, JournalPhoto, PasswordReset, HoopLegMeasurement, CageRecordInspection, CarTransfer];

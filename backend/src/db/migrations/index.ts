// Every migration in order, listed explicitly (no globs: tsx, tsc and vitest must all see the same set).
import { Accounts1796083200000 } from './1796083200000-accounts';
import { RulesetsAndChecks1796083300000 } from './1796083300000-rulesets-and-checks';
import { Garage1796083400000 } from './1796083400000-garage';
import { OutboxAndAudit1796083500000 } from './1796083500000-outbox-and-audit';
import { RulesetRechecks1796083600000 } from './1796083600000-ruleset-rechecks';
import { Review1796083700000 } from './1796083700000-review';
import { ResumableJobs1796083812000 } from './1796083812000-resumable-jobs';
import { TubeStock1796195189144 } from './1796195189144-tube-stock';
import { FabricationSettings1796196000000 } from './1796196000000-fabrication-settings';
import { BuildJournal1796197266052 } from './1796197266052-build-journal';
import { RateLimits1796198000000 } from './1796198000000-rate-limits';
import { PasswordResets1796198100000 } from './1796198100000-password-resets';
import { JobResults1796300000000 } from './1796300000000-job-results';
import { EditionSchedule1796300100000 } from './1796300100000-edition-schedule';
import { HoopLegMeasurements1796310000000 } from './1796310000000-hoop-leg-measurements';
import { CarTransfers1796320000000 } from './1796320000000-car-transfers';
import { CageRecordInspections1796320200000 } from './1796320200000-cage-record-inspections';

export const migrations = [Accounts1796083200000, RulesetsAndChecks1796083300000, Garage1796083400000, OutboxAndAudit1796083500000, RulesetRechecks1796083600000, Review1796083700000, ResumableJobs1796083812000, TubeStock1796195189144, FabricationSettings1796196000000, BuildJournal1796197266052, RateLimits1796198000000, PasswordResets1796198100000, JobResults1796300000000, EditionSchedule1796300100000, HoopLegMeasurements1796310000000, CarTransfers1796320000000, CageRecordInspections1796320200000];

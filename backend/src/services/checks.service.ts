// Checks: a specification against a ruleset version for one class. A dry run answers with the
// report and stores nothing; a saved run stores the specification as checked and its report as an
// immutable record with a verification code. Who may check: the access policy's `version.read` — a
// member of the club that owns the version (drafts only its admins). Anyone else gets the same 404 as
// for a version that does not exist.
import { randomBytes } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import type { CheckRunWire } from '../contracts/checks';
import type { CheckReport } from '../contracts/report';
import type { Specification } from '../contracts/specification';
import type { UnitSystem } from '../domain/units';
import { implausibleValues } from '../domain/field-ranges';
import { CheckRun, User } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { availableParallelism } from 'node:os';
import type { SideBySideResult } from '../domain/compare/side-by-side';
import { createInProcessEngine, createWorkerEngine, type CheckEngine, type CheckEngineStats, type CompareJob, type VerdictJob } from './check-engine';
import type { Verdict } from '../contracts/rulebook-admin';
import { parseCheckSpecification } from './check-input';
import { enforce } from './access';
import { versionFacts, type RulesetService } from './rulesets.service';
import { CODE_RANDOM_BYTES, codeForLookup, newVerificationCode } from '../domain/review/verification-code';

export interface CheckInput {
  rulesetVersionId: string;
  classId: string;
  /** Untrusted: parsed here with the shared specification schema. */
  specification: unknown;
  /** Who checks; must be a member of the version's club. */
  userId: string;
  /** Units for the report's reason texts (default: the rulebook's own). */
  unitSystem?: UnitSystem;
}

export interface SaveRunInput extends CheckInput {
  /** The build sheet revision the specification came from, when there is one. */
  buildSheetRevisionId?: string | null;
  /** Save inside the caller's transaction (say, with the build sheet revision it belongs to). */
  manager?: EntityManager;
}

/**
 * A new check run's code: the same generator and form as a cage record's (27 random Crockford
 * base32 characters and a check character, in groups of four). Runs saved before keep their older
 * 24-character codes, which still verify (domain/review/verification-code.ts, codeForLookup).
 */
export function newCheckRunCode(): string {
  return newVerificationCode(randomBytes(CODE_RANDOM_BYTES));
}

/** The specification, or a 400 naming every invalid field as `specification.<path>`. */
export function parseSpecificationOrThrow(json: unknown, classId: string): Specification {
  const outcome = parseCheckSpecification(json, classId);
  if (!outcome.ok) throw new ValidationError(outcome.problems);
  return outcome.specification;
}

/**
 * Refuses a specification typed by a person whose values are outside their fields' plausible ranges
 * (a units slip: "2,800 lb" read as 2.8), each at `specification.<path>`. For writes of typed input
 * only (a sheet saved, a dry run from the browser); a stored revision is re-checked without it, so a
 * revision saved before a range existed keeps checking.
 */
export function refuseImplausibleValues(specification: unknown): void {
  const problems = implausibleValues(specification);
  if (problems.length > 0) throw new ValidationError(problems.map((p) => ({ path: `specification.${p.path}`, message: p.message })));
}

function runView(run: CheckRun, creator: User | null): CheckRunWire {
  return {
    id: run.id,
    rulesetVersionId: run.rulesetVersionId,
    classId: run.classId,
    specification: run.specification,
    report: run.report,
    overallVerdict: run.overallVerdict,
    createdBy: creator ? { id: creator.id, displayName: creator.displayName } : null,
    createdAt: run.createdAt.toISOString(),
    buildSheetRevisionId: run.buildSheetRevisionId,
    verificationCode: run.verificationCode,
  };
}

export type CheckService = ReturnType<typeof createCheckService>;

export interface CheckServiceOptions {
  /** Where evaluations run: worker threads (default) or the calling thread. */
  engine?: 'workers' | 'in-process';
  /** Worker threads for the `workers` engine (default: cores − 1, at least 1). */
  workers?: number;
  /** Worker threads of the bulk pool (publish and impact re-checks); 0: on the calling thread. Default: one per core. */
  recheckWorkers?: number;
  /** Checks in flight in the interactive pool before a check is refused with checks_busy (default 200). */
  maxInFlight?: number;
}

/** Bulk re-checks: a stored specification's verdict, in the bulk pool. */
export interface VerdictEvaluator {
  verdict(job: VerdictJob): Promise<Verdict>;
  stats(): CheckEngineStats;
}

/**
 * The bulk pool ends its threads after this long without work; the next re-check starts them again. A
 * fresh thread compiles the engine's code anew (seconds of CPU on a busy machine), so a publish soon
 * after an impact preview finds them warm.
 */
const bulkIdleMs = 5 * 60_000;
/** Bulk threads yield the CPU to requests and builders' checks (nice 10: about a ninth of a normal share when both want it). */
const bulkNiceness = 10;

export function createCheckService(ds: DataSource, rulesets: RulesetService, options: CheckServiceOptions = {}) {
  const inProcess = () => createInProcessEngine((version) => rulesets.loadCompiled(version.id, version), () => rulesets.cacheStats().compiles);
  const documentFor = (version: VerdictJob['version']) => rulesets.loadDocument(version);
  const engine: CheckEngine =
    options.engine === 'in-process'
      ? inProcess()
      : createWorkerEngine({ ...(options.workers ? { size: options.workers } : {}), ...(options.maxInFlight ? { maxInFlight: options.maxInFlight } : {}), documentFor });
  // Bulk work has a pool of its own with no in-flight bound of its own (a re-check sends a page at a
  // time), so it can use every core without taking the interactive pool's places.
  const recheckWorkers = options.recheckWorkers ?? availableParallelism();
  const bulk: CheckEngine =
    options.engine === 'in-process' || recheckWorkers === 0
      ? inProcess()
      : createWorkerEngine({ size: recheckWorkers, maxInFlight: Number.POSITIVE_INFINITY, idleMs: bulkIdleMs, niceness: bulkNiceness, documentFor });

  /** Parses, checks access and state, and runs the engine; shared by dry and saved runs. */
  // The specification is parsed where it is evaluated (a worker thread, usually), so the server's
  // event loop does not pay for it twice; the route has already parsed it once for its 400s.
  async function check(input: CheckInput): Promise<{ specification: Specification; reportJson: string }> {
    const access = await rulesets.access(input.rulesetVersionId, input.userId);
    if (!access) throw new NotFoundError('Ruleset version not found.');
    // Every member may check against a version they see (builders, stewards and admins alike).
    enforce('version.read', versionFacts(access, input.userId), { notFound: 'Ruleset version not found.' });
    if (access.status === 'retired') {
      const currentVersionId = await rulesets.currentVersionOf(access.id);
      throw new ConflictError(
        'This ruleset version is retired: checks against it are no longer possible. Check against the rulebook’s current version.',
        currentVersionId ? { currentVersionId } : undefined,
      );
    }
    return engine.evaluate({
      version: { id: access.id, status: access.status, lockVersion: access.lockVersion },
      classId: input.classId,
      specification: input.specification,
      ...(input.unitSystem ? { unitSystem: input.unitSystem } : {}),
    });
  }

  async function visibleRun(run: CheckRun | null, viewerUserId: string, notFound: string): Promise<CheckRunWire> {
    if (!run) throw new NotFoundError(notFound);
    // Whoever saved the run needs no roles; spare the query. A run of a build sheet is also the car's:
    // after a sale its new owner reads the runs the seller saved (the sheet and its PDF reports follow the car).
    const carOwner: { owner_id: string }[] = run.createdById === viewerUserId || !run.buildSheetRevisionId ? [] : await ds.query(
      `SELECT c.owner_id FROM build_sheet_revisions r JOIN build_sheets s ON s.id = r.build_sheet_id JOIN cars c ON c.id = s.car_id WHERE r.id = $1`,
      [run.buildSheetRevisionId],
    );
    const ownerId = carOwner[0]?.owner_id === viewerUserId ? viewerUserId : run.createdById;
    const roles = ownerId === viewerUserId ? null : ((await rulesets.access(run.rulesetVersionId, viewerUserId))?.roles ?? null);
    enforce('checkRun.read', { actorId: viewerUserId, ownerId, roles }, { notFound });
    return runView(run, run.createdBy ?? null);
  }

  return {
    /** Which engine runs the checks, how many compilations it made, how busy it is. */
    engineStats: () => engine.stats(),

    /** The bulk pool, for the publish and impact re-checks. */
    bulk: { verdict: (job: VerdictJob) => bulk.verdict(job), stats: () => bulk.stats() } satisfies VerdictEvaluator,

    /** Ends the worker threads (they never keep the process alive, but tests and shutdown tidy up). */
    close: async () => {
      await Promise.all([engine.close(), bulk.close()]);
    },

    /**
     * A check whose report is returned and nothing is stored. Its specification is typed input (the
     * sheet being edited), so implausible values are refused as when a sheet is written.
     */
    async dryRun(input: CheckInput): Promise<CheckReport> {
      refuseImplausibleValues(input.specification);
      return JSON.parse((await check(input)).reportJson) as CheckReport;
    },

    /**
     * The same dry run, with the report as JSON text: the route sends it as it is, so a large
     * report is serialised once, off the event loop.
     */
    async dryRunJson(input: CheckInput): Promise<string> {
      refuseImplausibleValues(input.specification);
      return (await check(input)).reportJson;
    },

    /**
     * A stored specification against several rulebooks, side by side, in one job of the same engine:
     * parsed once, evaluated under each, and only the matrix comes back. The caller has checked access
     * and state.
     */
    compare: (job: CompareJob): Promise<SideBySideResult> => engine.compare(job),

    /** A check stored as an immutable record; the stored specification is the parsed one. */
    async saveRun(input: SaveRunInput): Promise<CheckRunWire> {
      const { specification, reportJson } = await check(input);
      const report = JSON.parse(reportJson) as CheckReport;
      const manager = input.manager ?? ds.manager;
      const run = await manager.getRepository(CheckRun).save(
        manager.getRepository(CheckRun).create({
          rulesetVersionId: input.rulesetVersionId,
          classId: input.classId,
          specification,
          report,
          overallVerdict: report.verdict,
          createdById: input.userId,
          buildSheetRevisionId: input.buildSheetRevisionId ?? null,
          verificationCode: newCheckRunCode(),
        }),
      );
      const creator = await manager.getRepository(User).findOneBy({ id: input.userId });
      return runView(run, creator);
    },

    /** A saved run, for its creator and the stewards and admins of the version's club; else 404. */
    async getRun(runId: string, viewerUserId: string): Promise<CheckRunWire> {
      const run = await ds.getRepository(CheckRun).findOne({ where: { id: runId }, relations: { createdBy: true } });
      return visibleRun(run, viewerUserId, 'Check run not found.');
    },

    /**
     * A saved run by the code printed on its PDF (current or older form), for the same people as
     * `getRun`; anyone else, a malformed code and an unknown one get the same 404.
     */
    async getRunByCode(typed: string, viewerUserId: string): Promise<CheckRunWire> {
      const { code } = codeForLookup(typed);
      const run = await ds.getRepository(CheckRun).findOne({ where: { verificationCode: code }, relations: { createdBy: true } });
      return visibleRun(run, viewerUserId, 'No check run you may see has this code.');
    },
  };
}

// The worker side of the check engine pools (check-engine.ts): validates and compiles a ruleset
// document the first time its key is seen, keeps the compilation (bounded), and evaluates
// specifications: a builder's check (parsed with the shared schema, the report serialised here), a
// stored sheet's verdict for a bulk re-check, or one sheet against several rulebooks (side by side). Runs in a worker thread, so neither holds up the
// server's event loop. Pure computation: no database, no I/O besides the message port (and, once, the
// thread's own id from /proc to lower its priority when asked).
import { readlinkSync } from 'node:fs';
import { setPriority } from 'node:os';
import { parentPort, workerData } from 'node:worker_threads';
import type { Specification } from '../contracts/specification';
import type { RulesetDocument } from '../contracts/ruleset';
import { compileRuleset, evaluateSpecification, UnknownClassError, validateRulesetDocument, type CompiledRuleset } from '../domain';
import { evaluateSideBySide, type RulebookToCompare } from '../domain/compare/side-by-side';
import { parseCompareSpecification, type CheckJobMessage, type CheckReplyMessage } from './check-engine';
import { parseCheckSpecification } from './check-input';

// Linux applies a priority to one thread when given the thread's id; other systems have no
// /proc/thread-self, and the worker then simply runs at the process's priority.
const niceness = (workerData as { niceness?: number } | null)?.niceness ?? 0;
if (niceness !== 0) {
  try {
    setPriority(Number(readlinkSync('/proc/thread-self').split('/').pop()), niceness);
  } catch {
    // not Linux, or not allowed: the same work at the usual priority
  }
}

const maxCompiled = 32;
const compiled = new Map<string, CompiledRuleset>();

function compiledFor(id: number, key: string, document: RulesetDocument | undefined): { ruleset: CompiledRuleset; compiledNow: boolean } | CheckReplyMessage {
  const cached = compiled.get(key);
  if (cached) {
    compiled.delete(key);
    compiled.set(key, cached);
    return { ruleset: cached, compiledNow: false };
  }
  if (document === undefined) return { id, ok: false, kind: 'need-document', message: 'document not held' };
  const validation = validateRulesetDocument(document);
  if (!validation.ok) return { id, ok: false, kind: 'invalid-ruleset', message: 'invalid ruleset document', problems: validation.problems };
  const ruleset = compileRuleset(validation.document);
  compiled.set(key, ruleset);
  while (compiled.size > maxCompiled) compiled.delete(compiled.keys().next().value as string);
  return { ruleset, compiledNow: true };
}

async function handle(msg: CheckJobMessage): Promise<CheckReplyMessage> {
  try {
    if (msg.type === 'compare') return await compare(msg);
    // The ruleset first: a document sent along is compiled even when the specification is bad.
    const got = compiledFor(msg.id, msg.key, msg.document);
    if ('id' in got) return got;
    if (msg.type === 'verdict') {
      // A stored specification was valid when it was saved; only its verdict crosses back.
      const spec = JSON.parse(msg.specificationJson) as Specification;
      return { id: msg.id, ok: true, verdict: (await evaluateSpecification(got.ruleset, msg.classId, spec)).verdict, compiled: got.compiledNow };
    }
    const parsed = parseCheckSpecification(msg.specification, msg.classId);
    if (!parsed.ok) return { id: msg.id, ok: false, kind: 'invalid-specification', message: 'invalid specification', problems: parsed.problems };
    const report = await evaluateSpecification(got.ruleset, msg.classId, parsed.specification, msg.unitSystem ? { unitSystem: msg.unitSystem } : {});
    // Serialised here, not on the server's event loop; the text crosses the thread boundary as is.
    return { id: msg.id, ok: true, reportJson: JSON.stringify(report), specification: parsed.specification, compiled: got.compiledNow };
  } catch (err) {
    if (err instanceof UnknownClassError) return { id: msg.id, ok: false, kind: 'unknown-class', message: err.message };
    return { id: msg.id, ok: false, kind: 'error', message: err instanceof Error ? err.message : String(err) };
  }
}

/** Every column's ruleset first (documents sent along are compiled), then the parse and the matrix. */
async function compare(msg: Extract<CheckJobMessage, { type: 'compare' }>): Promise<CheckReplyMessage> {
  const rulebooks: RulebookToCompare[] = [];
  let compiles = 0;
  for (const c of msg.columns) {
    const got = compiledFor(msg.id, c.key, c.document);
    if ('id' in got) return got;
    if (got.compiledNow) compiles++;
    rulebooks.push({ key: c.column, home: c.home, classId: c.classId, compiled: got.ruleset });
  }
  const parsed = parseCompareSpecification(msg);
  if (!parsed.ok) return { id: msg.id, ok: false, kind: 'invalid-specification', message: 'invalid specification', problems: parsed.problems };
  return { id: msg.id, ok: true, result: await evaluateSideBySide(parsed.specification, rulebooks, msg.unitSystem), compiled: compiles };
}

// One job at a time, in the order they came: the pool may hand a worker a whole page of sheets at
// once, and 200 evaluations interleaved at their awaits would each hold their facts and almanac in
// memory together (more garbage collection, colder caches) and all finish late instead of one by one.
const queue: CheckJobMessage[] = [];
let running = false;
async function drain(): Promise<void> {
  running = true;
  for (let msg = queue.shift(); msg; msg = queue.shift()) {
    const reply = await handle(msg);
    try {
      parentPort!.postMessage(reply);
    } catch (err) {
      // A reply that cannot cross (it should not happen): the job fails, the queue goes on.
      parentPort!.postMessage({ id: msg.id, ok: false, kind: 'error', message: err instanceof Error ? err.message : String(err) } satisfies CheckReplyMessage);
    }
  }
  running = false;
}

parentPort?.on('message', (msg: CheckJobMessage) => {
  queue.push(msg);
  if (!running) void drain();
});

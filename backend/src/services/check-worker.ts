// The worker side of the check engine pool (check-engine.ts): validates and compiles a ruleset
// document the first time its key is seen, keeps the compilation (bounded), and evaluates
// specifications. Runs in a worker thread, so a burst of checks never holds up the server's event
// loop. Pure computation: no database, no I/O besides the message port.
import { parentPort } from 'node:worker_threads';
import { compileRuleset, evaluateSpecification, UnknownClassError, validateRulesetDocument, type CompiledRuleset } from '../domain';
import type { CheckJobMessage, CheckReplyMessage } from './check-engine';
import { parseCheckSpecification } from './check-input';

const maxCompiled = 32;
const compiled = new Map<string, CompiledRuleset>();

function compiledFor(msg: CheckJobMessage): { ruleset: CompiledRuleset; compiledNow: boolean } | CheckReplyMessage {
  const cached = compiled.get(msg.key);
  if (cached) {
    compiled.delete(msg.key);
    compiled.set(msg.key, cached);
    return { ruleset: cached, compiledNow: false };
  }
  if (msg.document === undefined) return { id: msg.id, ok: false, kind: 'need-document', message: 'document not held' };
  const validation = validateRulesetDocument(msg.document);
  if (!validation.ok) return { id: msg.id, ok: false, kind: 'invalid-ruleset', message: 'invalid ruleset document', problems: validation.problems };
  const ruleset = compileRuleset(validation.document);
  compiled.set(msg.key, ruleset);
  while (compiled.size > maxCompiled) compiled.delete(compiled.keys().next().value as string);
  return { ruleset, compiledNow: true };
}

async function handle(msg: CheckJobMessage): Promise<CheckReplyMessage> {
  try {
    // The ruleset first: a document sent along is compiled even when the specification is bad.
    const got = compiledFor(msg);
    if ('id' in got) return got;
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

parentPort?.on('message', (msg: CheckJobMessage) => {
  void handle(msg).then((reply) => parentPort!.postMessage(reply));
});

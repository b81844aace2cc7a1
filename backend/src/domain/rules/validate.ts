// validateRulesetDocument: structure (zod) then meaning (facts, operators, units, classes,
// duplicate ids, nesting), every problem reported with its JSON path.
import { rulesetDocumentSchema } from '../../contracts/ruleset.js';
import type { DocumentProblem, RulesetDocument } from '../../contracts/ruleset.js';
import { compileDocument, problemCollector } from './compile.js';

export type RulesetValidation = { ok: true; document: RulesetDocument } | { ok: false; problems: DocumentProblem[] };

const MAX_JSON_DEPTH = 40;

function tooDeep(value: unknown, depth = 0): boolean {
  if (depth > MAX_JSON_DEPTH) return true;
  if (typeof value !== 'object' || value === null) return false;
  for (const v of Object.values(value)) if (tooDeep(v, depth + 1)) return true;
  return false;
}

export function validateRulesetDocument(json: unknown): RulesetValidation {
  // A hostile document nested thousands deep must not exhaust the stack in the parser.
  if (tooDeep(json)) return { ok: false, problems: [{ path: '', message: `The document is nested more than ${MAX_JSON_DEPTH} levels deep.` }] };
  const parsed = rulesetDocumentSchema.safeParse(json);
  if (!parsed.success) {
    return { ok: false, problems: parsed.error.issues.map((i) => ({ path: i.path.map(String).join('.'), message: i.message })) };
  }
  const problems = problemCollector();
  compileDocument(parsed.data, problems);
  if (problems.list.length > 0) return { ok: false, problems: problems.list };
  return { ok: true, document: parsed.data };
}

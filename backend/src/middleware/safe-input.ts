// The one check of untrusted text at the boundary where requests are parsed (issue 12, §3). PostgreSQL
// refuses a NUL character in text and jsonb, and jsonb refuses a lone UTF-16 surrogate; either would
// otherwise surface as a 500 from deep inside a query. Every string and every key of a JSON body, a query
// string, route parameters, multipart fields, and whatever a contract unpacks from a field (an imported
// ruleset's text) is walked once here and refused with `400 validation_failed` at its own path.
// The same walk bounds nesting (a deeply nested body would otherwise recurse through zod and the
// services) and refuses `__proto__` as a key (prototype pollution through spreads and merges).
// Iterative, so no input can exhaust the stack.
import type { RequestHandler } from 'express';
import { ValidationError, type FieldIssue } from '../errors';

export const maxNestingDepth = 32;
/** Stop collecting after this many problems: the answer stays small whatever the input. */
const maxIssues = 50;

const messages = {
  nul: 'Must not contain a NUL character (U+0000)',
  surrogate: 'Must not contain an unpaired UTF-16 surrogate',
  depth: `Nested too deeply (at most ${maxNestingDepth} levels)`,
  protoKey: 'Not allowed as a field name',
} as const;

// Code units, not code points (no `u` flag): a high surrogate not followed by a low one, or a low one
// not preceded by a high one. (String.prototype.isWellFormed is ES2024, beyond this project's lib.)
const loneSurrogate = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const loneSurrogates = new RegExp(loneSurrogate.source, 'g');

/** The problem with one string, if any. */
export function unsafeTextProblem(text: string): string | null {
  if (text.includes('\u0000')) return messages.nul;
  if (loneSurrogate.test(text)) return messages.surrogate;
  return null;
}

/** A path shown in an answer must itself be safe to store and print. */
function shownKey(key: string): string {
  return key.replaceAll('\u0000', '\\0').replace(loneSurrogates, '\uFFFD');
}

/**
 * Every unsafe string, key and over-deep nesting in `value`, each at its dotted path under `prefix`
 * (`name`, `members.0.label`, `query.show`, `params.code`).
 */
export function unsafeInputIssues(value: unknown, prefix?: string): FieldIssue[] {
  const issues: FieldIssue[] = [];
  const join = (path: string, key: string | number) => (path ? `${path}.${key}` : String(key));
  const stack: { v: unknown; path: string; depth: number }[] = [{ v: value, path: prefix ?? '', depth: 0 }];
  while (stack.length > 0 && issues.length < maxIssues) {
    const { v, path, depth } = stack.pop()!;
    if (typeof v === 'string') {
      const problem = unsafeTextProblem(v);
      if (problem) issues.push({ path: path || '(body)', message: problem });
      continue;
    }
    if (v === null || typeof v !== 'object') continue;
    if (depth >= maxNestingDepth) {
      issues.push({ path: path || '(body)', message: messages.depth });
      continue;
    }
    if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], path: join(path, i), depth: depth + 1 });
      continue;
    }
    const keys = Object.keys(v);
    for (let i = keys.length - 1; i >= 0; i--) {
      const key = keys[i]!;
      const keyProblem = key === '__proto__' ? messages.protoKey : unsafeTextProblem(key);
      if (keyProblem) {
        issues.push({ path: join(path, shownKey(key)), message: keyProblem });
        continue;
      }
      stack.push({ v: (v as Record<string, unknown>)[key], path: join(path, key), depth: depth + 1 });
    }
  }
  return issues;
}

/** Throws the 400 for `value` when it holds anything unsafe. */
export function assertSafeInput(value: unknown, prefix?: string): void {
  const issues = unsafeInputIssues(value, prefix);
  if (issues.length > 0) throw new ValidationError(issues);
}

/** Right after the body parser: the JSON body and the query string, before sessions or sign-in read them. */
export const refuseUnsafeInput: RequestHandler = (req, _res, next) => {
  const issues = [...unsafeInputIssues(req.query, 'query'), ...unsafeInputIssues(req.body)];
  next(issues.length > 0 ? new ValidationError(issues) : undefined);
};

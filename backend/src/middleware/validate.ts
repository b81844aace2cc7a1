// Turns zod failures into our ValidationError, listing every invalid field by its dotted path.
import type { z } from 'zod';
import { ValidationError, type FieldIssue } from '../errors';

export function fieldIssues(error: z.ZodError, prefix?: string): FieldIssue[] {
  return error.issues.map((issue) => {
    const path = [...(prefix ? [prefix] : []), ...issue.path.map(String)].join('.');
    return { path, message: issue.message };
  });
}

export function parseOrThrow<T>(schema: z.ZodType<T>, value: unknown, prefix?: string): T {
  const result = schema.safeParse(value);
  if (!result.success) throw new ValidationError(fieldIssues(result.error, prefix));
  return result.data;
}

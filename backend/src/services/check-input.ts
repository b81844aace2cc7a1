// Parsing a specification handed to a check, shared by the service (in process) and the check
// worker threads: the shared schema, every problem as `specification.<path>`, and the rule that the
// specification names the class being checked. Pure (no I/O), so a worker can import it.
import { issuesToProblems, specificationSchema, type FieldProblem, type Specification } from '../contracts/specification';

export type SpecificationOutcome = { ok: true; specification: Specification } | { ok: false; problems: FieldProblem[] };

export function parseCheckSpecification(json: unknown, classId: string): SpecificationOutcome {
  const result = specificationSchema.safeParse(json);
  if (!result.success) {
    return {
      ok: false,
      problems: issuesToProblems(result.error.issues).map((p) => ({ path: p.path ? `specification.${p.path}` : 'specification', message: p.message })),
    };
  }
  if (result.data.vehicle.classId !== classId) {
    return { ok: false, problems: [{ path: 'specification.vehicle.classId', message: `Must be the class being checked ("${classId}")` }] };
  }
  return { ok: true, specification: result.data };
}

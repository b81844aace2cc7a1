// Tube sizes for a starting shape, in the browser: the rulebook compiled here (in the engine's lazy
// chunk) and read by the domain's startingSizes, the same function the demo seed uses: per member
// kind, the lightest size the class's tube table lists for the car's weight band, on the class's own
// weight basis. When the table cannot say (no weight typed yet, no table for that kind), a common
// size stands in and the builder is told so.
import type { StartingSizes } from '@domain/tube-choice';
import { getRulesetVersion } from '@/api/rulesets';

export async function startingSizes(
  versionId: string,
  classId: string,
  vehicle: { weightWithDriverKg?: number; weightWithoutDriverKg?: number },
): Promise<StartingSizes> {
  const [version, engine] = await Promise.all([getRulesetVersion(versionId), import('./liveEngine')]);
  const compiled = engine.compileRuleset(engine.rulesetDocumentSchema.parse(version.document));
  return engine.startingSizes(compiled, classId, vehicle);
}

// Tube sizes for a starting shape: per member kind, the lightest size the class's tube table lists
// for the car's weight band (listedSizesForBand, the same function the fabrication pages use). The
// rulebook is compiled in the browser, in the engine's lazy chunk. When the table cannot say (no
// weight typed yet, no table for that kind), a common size stands in and the builder is told so.
import type { MemberKind } from '@domain/vocabulary';
import type { SizeFor } from '@domain/geometry/starting-shapes';
import { getRulesetVersion } from '@/api/rulesets';

/** Common practice sizes (not a rule): 45 × 2.5 mm for hoops and backstays, 38 × 2 mm for the rest. */
const COMMON = { primary: { odMm: 45, wallMm: 2.5 }, secondary: { odMm: 38, wallMm: 2 } };
const PRIMARY: readonly MemberKind[] = ['main_hoop', 'front_hoop', 'halo_hoop', 'lateral_hoop', 'rear_brace'];

export interface StartingSizes {
  sizeFor: SizeFor;
  /** Kinds that got a common size because the table gave none, with why. */
  fallbacks: Map<MemberKind, string>;
}

export async function startingSizes(versionId: string, classId: string, weightKg: number | undefined): Promise<StartingSizes> {
  const [version, engine] = await Promise.all([getRulesetVersion(versionId), import('./liveEngine')]);
  const compiled = engine.compileRuleset(engine.rulesetDocumentSchema.parse(version.document));
  const fallbacks = new Map<MemberKind, string>();
  const sizeFor: SizeFor = (kind) => {
    const common = PRIMARY.includes(kind) ? COMMON.primary : COMMON.secondary;
    const listed = engine.listedSizesForBand(compiled, { classId, memberKind: kind, weightKg, material: 'mild_steel' });
    if (listed.status === 'listed' && listed.sizes[0]) return { odMm: listed.sizes[0].odMm, wallMm: listed.sizes[0].wallMm };
    const why = { no_table: 'the rulebook lists no size for it', needs_weight: 'the car’s weight is not typed yet', outside_table: 'the car’s weight is outside the table', listed: 'no size' }[listed.status];
    fallbacks.set(kind, why);
    return common;
  };
  return { sizeFor, fallbacks };
}

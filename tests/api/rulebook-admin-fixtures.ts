// Shared by the rulebook administration tests: a saloon sheet that passes the demo rules, and a
// draft change that makes it fail (the saloon tube table's walls raised).
import { saloonSpec } from './garage-fixtures';

/** The garage tests' saloon, completed so that it passes: no bends to measure, harness bar height given. */
export function passingSaloonSpec() {
  const spec = saloonSpec();
  return {
    ...spec,
    members: spec.members.map((m) => ({ ...m, bends: [] })),
    geometry: { ...spec.geometry, harnessBarBelowShouldersMm: 40 },
  };
}

export interface DocLike {
  rulebook: { edition: string };
  requirements: { id: string; requires: { template: string; bands?: { rows: { alternatives: { od: number; wall: number }[] }[] }[]; allowances?: { thinWallWhenOdExceedsMinimum?: { minWall: number } } } }[];
}

/** Raises every wall of the saloon tube table (document units: inches in the demo rulebook) to `wallIn`. */
export function withSaloonWall<T extends DocLike>(doc: T, wallIn: number): T {
  const copy = structuredClone(doc);
  const req = copy.requirements.find((r) => r.id === 'tv-saloon-tubes')!;
  for (const band of req.requires.bands!) for (const row of band.rows) for (const alt of row.alternatives) alt.wall = wallIn;
  // The thin-wall allowance (a larger OD with a thinner wall) would let the old size through.
  const thin = req.requires.allowances?.thinWallWhenOdExceedsMinimum;
  if (thin) thin.minWall = wallIn;
  return copy;
}

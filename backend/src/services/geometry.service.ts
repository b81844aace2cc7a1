// Derived geometry of a cage model without a ruleset (POST /api/geometry/derive): pure, no storage.
import type { Specification } from '../contracts/specification';
import type { CageGeometryWire } from '../contracts/geometry';
import { describeCageGeometry } from '../domain/model-facts';

export function deriveGeometry(spec: Specification): CageGeometryWire {
  return describeCageGeometry(spec);
}

// The stock list a new club starts from: round tube sizes commonly stocked for cages. The sizes are
// common practice (catalogue ODs and gauge walls, F-UNIT-3 for the BWG walls), not any supplier's list;
// a club admin edits the club's copy. Yields are the standard's minimums where FACTS has them
// (F-MAT-1, ASTM A513: 1020 DOM 414 MPa, 1020 as-welded ERW 262 MPa, 4130 normalized 345 MPa);
// metric cold-drawn sizes carry no yield, because a grade was not sourced: the builder enters the
// mill certificate's figure. Canonical mm.
import type { StockTube } from './tube-choice.js';

const IN = 25.4;

export interface CommonStockTube extends StockTube {
  label: string;
  /** Where the yield comes from, shown beside it. */
  yieldSource?: string;
}

const A513 = 'ASTM A513 minimum (F-MAT-1)';

function imperial(odIn: number, wallIn: number, kind: 'dom' | 'erw' | '4130'): CommonStockTube {
  const od = odIn.toFixed(3).replace(/0+$/, '').replace(/\.$/, '');
  const wall = wallIn.toFixed(3);
  const base = { odMm: odIn * IN, wallMm: wallIn * IN };
  if (kind === 'dom') return { ...base, label: `${od} × ${wall} in DOM 1020`, material: 'mild_steel', process: 'dom', grade: '1020 DOM', yieldMpa: 414, yieldSource: A513 };
  if (kind === 'erw') return { ...base, label: `${od} × ${wall} in ERW 1020`, material: 'mild_steel', process: 'erw', grade: '1020 as-welded', yieldMpa: 262, yieldSource: A513 };
  return { ...base, label: `${od} × ${wall} in 4130 normalized`, material: 'chromoly_4130', process: 'seamless', grade: '4130 normalized', yieldMpa: 345, yieldSource: A513 };
}

function metric(odMm: number, wallMm: number): CommonStockTube {
  return { odMm, wallMm, label: `${odMm} × ${wallMm.toFixed(1)} mm cold drawn seamless`, material: 'mild_steel', process: 'cds' };
}

const OD_IN = [1.25, 1.375, 1.5, 1.625, 1.75, 1.875, 2.0];

/** Common sizes: OD 1.25–2.0 in and 38–50 mm; DOM, ERW and 4130 with their usual walls (common practice). */
export const COMMON_STOCK: readonly CommonStockTube[] = [
  ...OD_IN.flatMap((od) => [0.065, 0.083, 0.095, 0.120].map((w) => imperial(od, w, 'dom'))),
  ...OD_IN.flatMap((od) => [0.083, 0.095, 0.120].map((w) => imperial(od, w, 'erw'))),
  ...OD_IN.flatMap((od) => [0.058, 0.065, 0.083, 0.095, 0.120].map((w) => imperial(od, w, '4130'))),
  ...[38, 40, 42, 45, 48, 50].flatMap((od) => [2.0, 2.5, 3.0].map((w) => metric(od, w))),
];

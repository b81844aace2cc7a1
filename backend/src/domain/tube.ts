// Round-tube section properties and the tube-level measures rules use (bend radius over OD,
// ovality, plate area). Formulas: F-ENG-1 (hollow circle); mass per length from density (F-ENG-6).
// All inputs and outputs are canonical: mm, mm², mm³, mm⁴, kg/m.

export type Material = 'mild_steel' | 'chromoly_4130' | 'other';

/** g/cm³. Steel 7.85 (F-ENG-6: 4130 and 1020 both 7.85–7.87). "other" assumes steel, flagged in reports. */
export const DENSITY_G_PER_CM3: Readonly<Record<Material, number>> = {
  mild_steel: 7.85,
  chromoly_4130: 7.85,
  other: 7.85,
};

/** Tubes beyond this OD are not cage tube; a 40 in "tube" is a units mistake. */
export const MAX_PLAUSIBLE_OD_MM = 150;
export const MIN_PLAUSIBLE_OD_MM = 5;

export interface TubeSize {
  odMm: number;
  wallMm: number;
}

export interface TubeSectionProperties {
  odMm: number;
  wallMm: number;
  idMm: number;
  areaMm2: number;
  secondMomentMm4: number;
  sectionModulusMm3: number;
  radiusOfGyrationMm: number;
  torsionalConstantMm4: number;
  massPerMetreKg: number;
}

export interface TubeProblem {
  field: 'odMm' | 'wallMm';
  message: string;
}

// Problem messages name both unit systems: the reader may have typed either.
const both = (mm: number) => `${Math.round(mm * 100) / 100} mm (${(mm / 25.4).toFixed(3)} in)`;

/** Every reason a size cannot be a cage tube, in words a builder understands. Empty when plausible. */
export function tubeSizeProblems({ odMm, wallMm }: TubeSize): TubeProblem[] {
  const problems: TubeProblem[] = [];
  if (!Number.isFinite(odMm) || odMm <= 0) problems.push({ field: 'odMm', message: 'The outside diameter must be a positive number.' });
  else if (odMm > MAX_PLAUSIBLE_OD_MM)
    problems.push({ field: 'odMm', message: `An outside diameter of ${both(odMm)} is not a cage tube (over ${MAX_PLAUSIBLE_OD_MM} mm); check the units.` });
  else if (odMm < MIN_PLAUSIBLE_OD_MM)
    problems.push({ field: 'odMm', message: `An outside diameter of ${both(odMm)} is too small for a cage tube; check the units.` });
  if (!Number.isFinite(wallMm) || wallMm <= 0) problems.push({ field: 'wallMm', message: 'The wall thickness must be a positive number.' });
  else if (Number.isFinite(odMm) && odMm > 0 && wallMm >= odMm / 2)
    problems.push({ field: 'wallMm', message: `A wall of ${both(wallMm)} is half the outside diameter or more; the tube would be solid.` });
  return problems;
}

/** Section properties of a round tube. Throws with the first problem on an impossible size. */
export function tubeSectionProperties(size: TubeSize, material: Material = 'mild_steel'): TubeSectionProperties {
  const problems = tubeSizeProblems(size);
  if (problems.length > 0) throw new RangeError(problems.map((p) => p.message).join(' '));
  const { odMm: D, wallMm: t } = size;
  const d = D - 2 * t;
  const D2d2 = D * D - d * d;
  const D4d4 = D2d2 * (D * D + d * d);
  const areaMm2 = (Math.PI * D2d2) / 4;
  const secondMomentMm4 = (Math.PI * D4d4) / 64;
  const sectionModulusMm3 = secondMomentMm4 / (D / 2);
  const torsionalConstantMm4 = (Math.PI * D4d4) / 32;
  // mm² × g/cm³: 1 mm² × 1 m = 1 cm³ → grams per metre; /1000 → kg/m.
  const massPerMetreKg = (areaMm2 * DENSITY_G_PER_CM3[material]) / 1000;
  return {
    odMm: D,
    wallMm: t,
    idMm: d,
    areaMm2,
    secondMomentMm4,
    sectionModulusMm3,
    radiusOfGyrationMm: Math.sqrt(secondMomentMm4 / areaMm2),
    torsionalConstantMm4,
    massPerMetreKg,
  };
}

/** Centreline bend radius as a multiple of OD (rules commonly ask for ≥ 3; F-MSUK-G4). */
export function bendRadiusRatio(clrMm: number, odMm: number): number {
  if (!(clrMm > 0) || !(odMm > 0)) throw new RangeError('Bend radius and outside diameter must be positive.');
  return clrMm / odMm;
}

/** Ovality as minor over major diameter after bending (1 = round; F-MSUK-G4 asks ≥ 0.9). */
export function ovalityRatio(minOdMm: number, maxOdMm: number): number {
  if (!(minOdMm > 0) || !(maxOdMm > 0)) throw new RangeError('Measured diameters must be positive.');
  const lo = Math.min(minOdMm, maxOdMm);
  const hi = Math.max(minOdMm, maxOdMm);
  return lo / hi;
}

export interface PlateShape {
  /** Side lengths of a rectangular plate, or of its bounding outline. */
  sidesMm: [number, number];
  /** Measured area when the plate is not rectangular; else the product of the sides. */
  areaMm2?: number;
}

export function plateArea({ sidesMm, areaMm2 }: PlateShape): number {
  return areaMm2 ?? sidesMm[0] * sidesMm[1];
}

export function plateLeastSide({ sidesMm }: PlateShape): number {
  return Math.min(sidesMm[0], sidesMm[1]);
}

export function plateLongestSide({ sidesMm }: PlateShape): number {
  return Math.max(sidesMm[0], sidesMm[1]);
}

/** How much a tube's OD exceeds a table's minimum OD (negative when smaller). */
export function odMarginOverMinimum(odMm: number, tableMinimumOdMm: number): number {
  return odMm - tableMinimumOdMm;
}

/** Mass of a length of tube in kg. */
export function tubeMassKg(props: Pick<TubeSectionProperties, 'massPerMetreKg'>, lengthMm: number): number {
  return (props.massPerMetreKg * lengthMm) / 1000;
}

// Ordered grades: material grades of tube and property classes of bolts, each with its minimum
// yield and tensile strength (canonical MPa), so a rule can say "at least AS 1163 C300" and a grade
// written on the sheet answers it without a mill certificate. "At least grade G" means both minimums
// are at least G's: a grade with more tensile but less yield does not meet it. Every value says
// where it comes from: a FACTS.md id, or "memory" where no published source was at hand.
// Names are compared normalised: case, spaces, hyphens and a leading "grade"/"class" do not count,
// so "AS1163 C350" and "as 1163 c350" are one grade.

export type GradeFamily = 'material' | 'bolt';

export interface Grade {
  id: string;
  /** How it is shown and written in rulesets. */
  name: string;
  family: GradeFamily;
  minYieldMpa: number;
  minTensileMpa: number;
  /** FACTS.md id, or "memory: …" when the values are not from a published source at hand. */
  source: string;
  /** Other ways people write the same grade (normalised on comparison). */
  aliases: readonly string[];
}

const KSI = 6.894757;
const ksi = (x: number) => Math.round(x * KSI);

const MATERIAL: Grade[] = [
  { id: 'a513-1020-normalized', name: 'ASTM A513 1020 normalized', family: 'material', minYieldMpa: 241, minTensileMpa: 345, source: 'F-MAT-1', aliases: ['1020 normalized', 'A513 1020 normalized'] },
  { id: 'as1163-c250', name: 'AS 1163 C250', family: 'material', minYieldMpa: 250, minTensileMpa: 320, source: 'F-MAT-7', aliases: ['C250', 'AS 1163 Grade 250', 'AS/NZS 1163 C250'] },
  { id: 'a513-1020-erw', name: 'ASTM A513 1020 as-welded', family: 'material', minYieldMpa: 262, minTensileMpa: 359, source: 'F-MAT-1', aliases: ['1020 as-welded', '1020 ERW', 'A513 1020 ERW', 'A513 1020 as-welded'] },
  // F-SSA-1 names "AS 1163 Grade 300" without its numbers; 300 MPa is what the grade number means in
  // AS 1163, the 400 MPa tensile minimum is from memory.
  { id: 'as1163-c300', name: 'AS 1163 C300', family: 'material', minYieldMpa: 300, minTensileMpa: 400, source: 'memory: yield from the grade number (F-SSA-1 names the grade), tensile 400 MPa from memory', aliases: ['C300', 'AS 1163 Grade 300', 'AS/NZS 1163 C300'] },
  { id: '4130', name: '4130 (condition not stated)', family: 'material', minYieldMpa: 345, minTensileMpa: 483, source: 'F-MAT-1 (the lowest of its 4130 conditions)', aliases: ['4130', 'AISI 4130', 'SAE 4130', '4130 chromoly', 'chromoly'] },
  { id: 'a513-4130-normalized', name: 'ASTM A513 4130 normalized', family: 'material', minYieldMpa: 345, minTensileMpa: 483, source: 'F-MAT-1', aliases: ['4130 normalized', '4130 N', 'A513 4130 normalized'] },
  { id: 'as1163-c350', name: 'AS 1163 C350', family: 'material', minYieldMpa: 350, minTensileMpa: 430, source: 'F-MAT-7', aliases: ['C350', 'AS 1163 Grade 350', 'AS/NZS 1163 C350'] },
  { id: 'a513-4130-erw', name: 'ASTM A513 4130 as-welded', family: 'material', minYieldMpa: 379, minTensileMpa: 496, source: 'F-MAT-1', aliases: ['4130 as-welded', 'A513 4130 as-welded'] },
  { id: 'a513-1020-dom', name: 'ASTM A513 1020 DOM', family: 'material', minYieldMpa: 414, minTensileMpa: 483, source: 'F-MAT-1', aliases: ['1020 DOM', '1020 mandrel-drawn', 'A513 1020 DOM'] },
  { id: 'a513-1026-dom', name: 'ASTM A513 1026 DOM', family: 'material', minYieldMpa: 483, minTensileMpa: 552, source: 'F-MAT-1', aliases: ['1026 DOM', '1026 mandrel-drawn', 'A513 1026 DOM'] },
  { id: 'a513-4130-dom', name: 'ASTM A513 4130 mandrel-drawn', family: 'material', minYieldMpa: 586, minTensileMpa: 655, source: 'F-MAT-1', aliases: ['4130 mandrel-drawn', '4130 DOM', 'A513 4130 DOM'] },
];

// Bolt strengths: ISO 898-1 minimums for d ≤ 16 mm and SAE J429 for sizes up to 1 in, all from
// memory (FACTS.md holds none; F-MSUK-W2 only names "ISO 8.8 or better").
const BOLT: Grade[] = [
  { id: 'iso-8.8', name: 'ISO 8.8', family: 'bolt', minYieldMpa: 640, minTensileMpa: 800, source: 'memory: ISO 898-1, d ≤ 16 mm', aliases: ['8.8', 'class 8.8', 'property class 8.8'] },
  { id: 'sae-5', name: 'SAE Grade 5', family: 'bolt', minYieldMpa: ksi(92), minTensileMpa: ksi(120), source: 'memory: SAE J429, ¼–1 in', aliases: ['grade 5', 'SAE 5', 'SAE J429 Grade 5'] },
  { id: 'sae-8', name: 'SAE Grade 8', family: 'bolt', minYieldMpa: ksi(130), minTensileMpa: ksi(150), source: 'memory: SAE J429', aliases: ['grade 8', 'SAE 8', 'SAE J429 Grade 8'] },
  { id: 'iso-10.9', name: 'ISO 10.9', family: 'bolt', minYieldMpa: 940, minTensileMpa: 1040, source: 'memory: ISO 898-1', aliases: ['10.9', 'class 10.9', 'property class 10.9'] },
  { id: 'iso-12.9', name: 'ISO 12.9', family: 'bolt', minYieldMpa: 1100, minTensileMpa: 1220, source: 'memory: ISO 898-1', aliases: ['12.9', 'class 12.9', 'property class 12.9'] },
];

const byStrength = (a: Grade, b: Grade) => a.minTensileMpa - b.minTensileMpa || a.minYieldMpa - b.minYieldMpa;

/** Each family in one order: weakest first (by tensile, then yield). */
export const GRADES: Readonly<Record<GradeFamily, readonly Grade[]>> = {
  material: [...MATERIAL].sort(byStrength),
  bolt: [...BOLT].sort(byStrength),
};

export function normaliseGradeName(text: string): string {
  return text.toLowerCase().replace(/[\s\-_/]+/g, '').replace(/^(grade|class|propertyclass)/, '');
}

const LOOKUP: ReadonlyMap<string, Grade> = (() => {
  const map = new Map<string, Grade>();
  for (const g of [...MATERIAL, ...BOLT]) {
    for (const n of [g.name, g.id, ...g.aliases]) {
      const key = `${g.family}|${normaliseGradeName(n)}`;
      const clash = map.get(key);
      if (clash && clash.id !== g.id) throw new Error(`Grade name "${n}" means both ${clash.id} and ${g.id}`);
      map.set(key, g);
    }
  }
  return map;
})();

// Texts already looked up (the tube chooser asks for the same few grades hundreds of times a choice).
const FOUND = new Map<string, Grade | null>();
const FOUND_LIMIT = 5000;

/** The grade a text names in a family, or undefined when it is not in the vocabulary. */
export function findGrade(family: GradeFamily, text: string | undefined): Grade | undefined {
  if (typeof text !== 'string' || text.trim() === '') return undefined;
  const key = `${family}|${text}`;
  let found = FOUND.get(key);
  if (found === undefined) {
    if (FOUND.size >= FOUND_LIMIT) FOUND.clear();
    found = LOOKUP.get(`${family}|${normaliseGradeName(text)}`) ?? null;
    FOUND.set(key, found);
  }
  return found ?? undefined;
}

/** Whether grade `g` meets "at least `floor`": both minimums at least the floor's. */
export function gradeAtLeast(g: Grade, floor: Grade): boolean {
  return g.family === floor.family && g.minYieldMpa >= floor.minYieldMpa && g.minTensileMpa >= floor.minTensileMpa;
}

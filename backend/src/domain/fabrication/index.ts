// Fabrication arithmetic: copes, bends and springback, the cut and bend schedule, hoop leg trim and
// the buying list. Pure functions over canonical units (mm, deg, kg).
export * from './cope';
export * from './bends';
export * from './cut-schedule';
export * from './leg-trim';
export * from './nesting';
export * from './sheet-fabrication';

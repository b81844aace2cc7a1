// Plain trade words for every closed list the specification uses, for selects and for findings.
import {
  CHASSIS_TYPES, COCKPIT_TYPES, DRIVER_SIDES, FUELS, MEMBER_SIDES, MATERIALS, MEMBER_KINDS, MEMBER_KIND_LABELS, PADDING_STANDARDS, PLATE_FIXINGS,
  PLATE_LOCATIONS, PROCESSES, WALL_METHODS, WELDING_PROCESSES,
} from '@domain/vocabulary';

const WORDS: Record<string, string> = {
  mild_steel: 'Mild steel',
  chromoly_4130: '4130 chromoly',
  other: 'Other',
  dom: 'DOM',
  erw: 'ERW',
  seamless: 'Seamless',
  cds: 'CDS',
  unibody: 'Unibody',
  tube_frame: 'Tube frame',
  open: 'Open',
  closed: 'Closed',
  petrol: 'Petrol',
  diesel: 'Diesel',
  ethanol: 'Ethanol',
  methanol: 'Methanol',
  electric: 'Electric',
  welded: 'Welded',
  bolted: 'Bolted',
  main_hoop_foot: 'Main hoop foot',
  front_hoop_foot: 'Front hoop foot',
  rear_brace_foot: 'Rear brace foot',
  lateral_hoop_foot: 'Lateral hoop foot',
  tig: 'TIG',
  mig: 'MIG',
  stick: 'Stick',
  gas: 'Gas',
  sfi_45_1: 'SFI 45.1',
  fia_8857_2001: 'FIA 8857-2001',
  non_homologated: 'Not to a standard',
  none: 'No padding',
  ultrasonic: 'Ultrasonic gauge',
  inspection_hole: 'Inspection hole',
  left: 'Left',
  right: 'Right',
  centre: 'Centre',
  callipers: 'Callipers at a tube end',
};

const kindLabel = (k: string) => MEMBER_KIND_LABELS[k as keyof typeof MEMBER_KIND_LABELS];

/** A value from any closed list in words ("chromoly_4130" → "4130 chromoly", "main_hoop" → "Main hoop"). */
export function valueLabel(value: string): string {
  // "other" is in several lists; only the member-kind list calls it "other member" (kindOptionLabel).
  const word = WORDS[value];
  if (word) return word;
  const kind = kindLabel(value);
  if (kind) return kind.charAt(0).toUpperCase() + kind.slice(1);
  return value.replace(/_/g, ' ');
}

function kindOptionLabel(kind: string): string {
  const label = kindLabel(kind) ?? kind;
  return label.charAt(0).toUpperCase() + label.slice(1);
}

export interface Option {
  label: string;
  value: string;
}

const options = (values: readonly string[]): Option[] => values.map((value) => ({ label: valueLabel(value), value }));

export const OPTIONS = {
  kind: MEMBER_KINDS.map((value) => ({ label: kindOptionLabel(value), value })),
  material: options(MATERIALS),
  process: options(PROCESSES),
  chassis: options(CHASSIS_TYPES),
  cockpit: options(COCKPIT_TYPES),
  fuel: options(FUELS),
  fixing: options(PLATE_FIXINGS),
  location: options(PLATE_LOCATIONS),
  welding: options(WELDING_PROCESSES),
  padding: options(PADDING_STANDARDS),
  wallMethod: options(WALL_METHODS),
  side: options(MEMBER_SIDES),
  driverSide: options(DRIVER_SIDES),
} as const;

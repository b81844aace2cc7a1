// The trade's closed vocabularies, shared by the specification, the ruleset format and the fact
// catalogue. Kept in the domain (not the contracts) so domain code never imports wire schemas.

export const MEMBER_KINDS = [
  'main_hoop', 'front_hoop', 'halo_hoop', 'lateral_hoop', 'rear_brace', 'harness_bar', 'door_bar',
  'diagonal', 'roof_bar', 'a_pillar', 'dash_bar', 'gusset', 'other',
] as const;
export type MemberKind = (typeof MEMBER_KINDS)[number];

export const MEMBER_KIND_LABELS: Readonly<Record<MemberKind, string>> = {
  main_hoop: 'main hoop', front_hoop: 'front hoop', halo_hoop: 'halo hoop', lateral_hoop: 'lateral hoop',
  rear_brace: 'rear brace (backstay)', harness_bar: 'harness bar', door_bar: 'door bar', diagonal: 'diagonal',
  roof_bar: 'roof bar', a_pillar: 'A-pillar bar', dash_bar: 'dash bar', gusset: 'gusset', other: 'other member',
};

/** The same, counted: "number of door bars on the right", never "number of door bar". */
export const MEMBER_KIND_PLURAL_LABELS: Readonly<Record<MemberKind, string>> = {
  main_hoop: 'main hoops', front_hoop: 'front hoops', halo_hoop: 'halo hoops', lateral_hoop: 'lateral hoops',
  rear_brace: 'rear braces (backstays)', harness_bar: 'harness bars', door_bar: 'door bars', diagonal: 'diagonals',
  roof_bar: 'roof bars', a_pillar: 'A-pillar bars', dash_bar: 'dash bars', gusset: 'gussets', other: 'other members',
};

export const MATERIALS = ['mild_steel', 'chromoly_4130', 'other'] as const;
export const PROCESSES = ['dom', 'erw', 'seamless', 'cds', 'other'] as const;

/** Words for generated sentences, so a reason never shows a vocabulary key like "mild_steel". */
export const MATERIAL_LABELS: Readonly<Record<(typeof MATERIALS)[number], string>> = {
  mild_steel: 'mild steel', chromoly_4130: '4130 chromoly', other: 'other material',
};
export const PROCESS_LABELS: Readonly<Record<(typeof PROCESSES)[number], string>> = {
  dom: 'DOM', erw: 'ERW', seamless: 'seamless', cds: 'CDS', other: 'other process',
};
export const JOINT_KINDS = ['welded', 'bolted', 'removable'] as const;
export const CHASSIS_TYPES = ['unibody', 'tube_frame'] as const;
export const COCKPIT_TYPES = ['open', 'closed'] as const;
export const FUELS = ['petrol', 'diesel', 'ethanol', 'methanol', 'electric', 'other'] as const;
export const PLATE_FIXINGS = ['welded', 'bolted'] as const;
export const PLATE_LOCATIONS = ['main_hoop_foot', 'front_hoop_foot', 'rear_brace_foot', 'lateral_hoop_foot', 'other'] as const;
export const WELDING_PROCESSES = ['tig', 'mig', 'stick', 'gas', 'other'] as const;
export const PADDING_STANDARDS = ['sfi_45_1', 'fia_8857_2001', 'non_homologated', 'none'] as const;
export const WALL_METHODS = ['ultrasonic', 'inspection_hole', 'callipers'] as const;
export type WallMethod = (typeof WALL_METHODS)[number];

export type PlateLocation = (typeof PLATE_LOCATIONS)[number];

/** Which side of the car a member is on (y > 0 is the car's left in the cage frame). */
export const MEMBER_SIDES = ['left', 'right', 'centre'] as const;
export type MemberSide = (typeof MEMBER_SIDES)[number];
export const DRIVER_SIDES = ['left', 'right'] as const;
export type DriverSide = (typeof DRIVER_SIDES)[number];
/**
 * Member kinds that can sit on one side of the car. Hoops, the harness bar and the dash bar span
 * the car from side to side, so a side on them is a mistake on the sheet, not a fact.
 */
export const SIDED_MEMBER_KINDS: readonly MemberKind[] = ['lateral_hoop', 'rear_brace', 'door_bar', 'diagonal', 'roof_bar', 'a_pillar', 'gusset', 'other'];
export const MEMBER_SIDE_LABELS: Readonly<Record<MemberSide, string>> = { left: 'left', right: 'right', centre: 'centre' };

/**
 * Words for the other vocabulary keys that reach a generated sentence (a condition on the member kinds
 * present, a welding process, a padding standard), so no reason shows "roof_bar" or "fia_8857_2001".
 */
export const OTHER_VOCABULARY_WORDS: Readonly<Record<string, string>> = {
  ...MEMBER_KIND_LABELS,
  tube_frame: 'tube frame', tig: 'TIG', mig: 'MIG', sfi_45_1: 'SFI 45.1', fia_8857_2001: 'FIA 8857-2001', non_homologated: 'non-homologated',
  main_hoop_foot: 'main hoop foot', front_hoop_foot: 'front hoop foot', rear_brace_foot: 'rear brace foot', lateral_hoop_foot: 'lateral hoop foot',
  inspection_hole: 'inspection hole',
};

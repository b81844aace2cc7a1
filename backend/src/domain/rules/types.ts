// Types of a compiled ruleset: json-rules-engine rules plus the metadata that turns an engine
// result back into a finding (labels, nominal required values, tube-table alternatives).
import type { RuleProperties } from 'json-rules-engine';
import type { RequirementArea, RequirementScope, RulesetClass, RulesetDocument, StrengthMeasure } from '../../contracts/ruleset.js';
import type { CanonicalStrengthPolicy } from './templates.js';
import type { Dimension } from '../units.js';
import type { FriendlyOperator } from './operators.js';
import type { TemplateName } from './template-kinds.js';

/** `{ fact }`: another value of the check; `times`: k × it (canonical; `timesDimension` null for a plain factor). */
export type LeafValue = number | string | boolean | readonly string[] | { fact: string; times?: number; timesDimension?: Dimension | null };

export interface LeafMeta {
  fact: string;
  label: string;
  dimension: Dimension | null;
  operator: FriendlyOperator;
  /** Nominal required value, canonical units (before tolerance). */
  value: LeafValue;
  path?: string;
  /** Tells apart comparisons of one dynamic fact with different params (left vs right counts). */
  paramsKey?: string;
  /** A calendar-date comparison (words "before" / "on or after", dates shown as "1 Jan 1995"). */
  date?: true;
}

export interface AlternativeMeta {
  label: string;
  odMm: number;
  wallMm: number;
  /** Wall the engine compares with, after any wall allowance (canonical mm). */
  requiredWallMm: number;
  materials?: readonly string[];
  processes?: readonly string[];
  /** Counts only for cages approved before this date (YYYY-MM-DD). */
  approvedBefore?: string;
  source: 'table' | 'allowance' | 'printed_equivalent' | 'strength_equivalent';
  /** A printed equivalent: the listed size it stands for (canonical mm), so each reader gets both in their units. */
  equivalentOf?: { odMm: number; wallMm: number };
  /**
   * An equivalent by strength of the listed size odMm × wallMm (its `label` is the listed one's
   * label): the measure, the value the member must reach (canonical mm³ or N·mm), and the policy's
   * yield and least wall.
   */
  equivalence?: { measure: StrengthMeasure; listedLabel: string; requiredValue: number; listedYieldMpa?: number; minWallMm?: number };
  /** With a tube table's `measuredWall`: the thinnest reading the member needs, and its fact. */
  requiredReadingMm?: number;
  readingFact?: string;
  note?: string;
}

export interface CompiledVariant {
  /** Weight band (canonical kg) the variant serves; null bounds are open. */
  aboveKg: number | null;
  upToKg: number | null;
  bandLabel?: string;
  rule: RuleProperties;
}

export interface CompiledRequirement {
  id: string;
  index: number;
  title: string;
  section: string;
  severity: 'mandatory' | 'advisory';
  area: RequirementArea;
  scope: RequirementScope;
  template: TemplateName;
  classes: readonly string[] | null;
  explanation: string;
  /** A maker's certificate on the sheet stands in for this requirement. */
  acceptsMakerCertificate: boolean;
  /** One per weight band for a banded tube table, else exactly one. */
  variants: CompiledVariant[];
  leaves: Readonly<Record<string, LeafMeta>>;
  alternatives: Readonly<Record<string, AlternativeMeta>>;
  factsUsed: readonly string[];
}

export interface CompiledPolicy {
  acceptPrintedEquivalents: boolean;
  /** Equivalence by strength: accepted or advisory, by which measure (off and section modulus when the document says nothing). */
  strength: CanonicalStrengthPolicy;
  /** Canonical units per dimension. */
  tolerance: Partial<Record<Dimension, number>>;
}

export interface CompiledRuleset {
  document: RulesetDocument;
  classes: Readonly<Record<string, RulesetClass>>;
  /** Listed class weights (canonical kg) for the classes that give one. */
  listedWeightsKg: Readonly<Record<string, number>>;
  requirements: readonly CompiledRequirement[];
  policy: CompiledPolicy;
}

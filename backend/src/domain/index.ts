// The pure domain of Cagewright, in one import for the server and the front end's previews.
export * from './units.js';
export * from './typed-number.js';
export * from './field-ranges.js';
export * from './tube.js';
export * from './vocabulary.js';
export * from './dates.js';
export * from './facts.js';
export { compileRuleset, RulesetInvalidError } from './rules/compile.js';
export { validateRulesetDocument } from './rules/validate.js';
export type { RulesetValidation } from './rules/validate.js';
export { evaluateSpecification, UnknownClassError, walkPath } from './rules/evaluate.js';
export type { EvaluateOptions } from './rules/evaluate.js';
export type { CompiledRuleset, CompiledRequirement } from './rules/types.js';

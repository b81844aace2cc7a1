// The rules engine for the live check, in a chunk of its own: the build sheet draws and can be edited
// before it arrives, which keeps the page's first JavaScript under its budget (tests/bench/bundle.ts).
export { compileRuleset } from '@domain/rules/compile';
export { evaluateSpecification } from '@domain/rules/evaluate';
export { rulesetDocumentSchema } from '@contracts/ruleset';
export { listedSizesForBand, startingSizes } from '@domain/tube-choice';

import { compileRuleset } from '../../backend/src/domain/rules/compile.js';
import { chooseTubesForSheet } from '../../backend/src/domain/tube-choice-sheet.js';
import { buildBenchRuleset, buildBenchSpecification } from './fixtures.js';
import { benchStock } from './tube-choice.js';
const compiled = compileRuleset(buildBenchRuleset().document);
const spec = buildBenchSpecification();
const stock = benchStock();
for (let i = 0; i < 400; i++) chooseTubesForSheet(compiled, spec, stock);
console.log(spec.members.map((m) => m.kind).join(','));

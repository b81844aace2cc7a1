// The cage model as the browser saves it: a cage made from a starting shape, a node moved in the node
// table and a member mirrored all reach the API with the model's nodes and every member's path (a
// draft that dropped the nodes would be refused with "A path needs the model's nodes"); a sheet loaded
// with a model keeps it through an unrelated edit; the model's lengths and sides are shown, not asked.
import { afterEach, beforeEach, expect, test, vi } from 'vitest';
import BuildSheetView from '@/views/BuildSheetView.vue';
import { http } from '@/api/http';
import { forgetRulesetVersions } from '@/api/rulesets';
import { useSessionStore } from '@/stores/session';
import type { Specification } from '@contracts/specification';
import { specificationSchema } from '@contracts/specification';
import { createFetchMock, csrfToken, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';
import { sheetDetail, sheetId, versionBody, versionId } from './garage-fixtures';

const me = session([{ club: tarnwick, roles: ['builder'] }], { preferredUnits: 'metric' });
const sheetPath = `/api/build-sheets/${sheetId}`;
let mock: ReturnType<typeof createFetchMock>;

/** The fixture sheet with no members yet (a new sheet), or with the given specification. */
function detail(revision: number, specification?: Specification) {
  const d = sheetDetail(revision);
  d.revision.specification = specification ?? { vehicle: { classId: 'open-sprint', weightWithoutDriverKg: 635 }, members: [] };
  return d;
}

beforeEach(() => {
  http.resetCsrfToken();
  forgetRulesetVersions();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  vi.stubGlobal('confirm', () => true);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-model'));
  mock.on('GET', `/api/ruleset-versions/${versionId}`, json(200, versionBody));
});
afterEach(() => {
  document.body.innerHTML = '';
  vi.unstubAllGlobals();
});

async function openSheet() {
  await mountAt(`/build-sheets/${sheetId}`, BuildSheetView, () => useSessionStore().setSession(me));
  await settle();
}
async function type(input: HTMLInputElement, text: string) {
  input.value = text;
  input.dispatchEvent(new Event('input'));
  await settle();
}
const byLabel = (label: string) => {
  const l = [...document.querySelectorAll('label')].find((x) => x.textContent?.trim() === label);
  if (!l) throw new Error(`no label "${label}"`);
  return document.getElementById(l.htmlFor) as HTMLInputElement;
};
async function click(label: string | RegExp) {
  const b = [...document.querySelectorAll('button')].find((x) => (typeof label === 'string' ? x.textContent?.trim() === label || x.getAttribute('aria-label') === label : label.test(x.getAttribute('aria-label') ?? x.textContent ?? '')));
  if (!b) throw new Error(`no button ${label}`);
  b.click();
  await settle();
}
const puts = () => mock.calls.filter((c) => c.method === 'PUT' && c.path === `${sheetPath}/specification`);
const saved = (i = 0) => (puts()[i]!.body as { specification: Specification }).specification;

test('a cage made from a starting shape, a node moved and a member mirrored are saved with every node and path', async () => {
  mock.on('GET', sheetPath, json(200, detail(1)));
  mock.on('PUT', `${sheetPath}/specification`, (call) => json(200, detail(2, (call.body as { specification: Specification }).specification)));
  await openSheet();
  // A new sheet offers the starting shapes where its drawing will be.
  await vi.waitFor(() => expect(document.querySelector('[aria-labelledby="drawing-empty-heading"] form')).not.toBeNull(), { timeout: 15_000 });
  const form = document.querySelector<HTMLFormElement>('form[aria-labelledby="start-heading"]')!;
  (form.querySelectorAll('select')[0] as HTMLSelectElement).value = 'none'; // nothing in front
  form.querySelectorAll('select')[0]!.dispatchEvent(new Event('change'));
  (form.querySelectorAll('select')[1] as HTMLSelectElement).value = 'none'; // no door bars
  form.querySelectorAll('select')[1]!.dispatchEvent(new Event('change'));
  await settle();
  await type(byLabel('Main hoop width at the feet (centre to centre)'), '1200');
  await type(byLabel('Main hoop width at the top corners'), '1000');
  await type(byLabel('Main hoop height, floor to top'), '1100');
  await type(byLabel('Main hoop lean back from vertical'), '5');
  await type(byLabel('Backstays land this far behind the hoop'), '900');
  form.dispatchEvent(new Event('submit'));
  // The sizes come from the rulebook compiled in the engine's lazy chunk: wait for the cage.
  await vi.waitFor(() => expect(document.querySelectorAll('[data-node-id]').length).toBeGreaterThan(6), { timeout: 15_000 });
  await settle();

  // Move the left backstay's landing 50 mm further back in the node table.
  const row = document.querySelector<HTMLElement>('[data-node-id="bs-foot-l"]')!;
  const x = row.querySelectorAll<HTMLInputElement>('.qty__input')[0]!;
  const before = Number(x.value);
  const side = () => document.querySelector('[data-view="side"]')!.innerHTML;
  const drawn = side();
  await type(x, String(before - 50));
  // The drawing follows the table at once.
  expect(side()).not.toBe(drawn);
  // Remove the right backstay and mirror the left one in its place, as a builder would.
  await click(/^Remove backstay right$/i);
  await click(/^Mirror backstay left to the other side$/i);
  await click('Save');

  expect(puts()).toHaveLength(1);
  const spec = saved();
  // The saved body is what the server's own schema accepts: nodes present, every path through them.
  expect(specificationSchema.safeParse(spec).success).toBe(true);
  const nodes = new Map(spec.model!.nodes.map((n) => [n.id, n]));
  expect(nodes.size).toBeGreaterThan(6);
  for (const m of spec.members) {
    expect(m.path?.length, `${m.label} has a path`).toBeGreaterThanOrEqual(2);
    for (const e of m.path!) expect(nodes.has(e.nodeId), `${m.label}: node ${e.nodeId}`).toBe(true);
  }
  const left = spec.members.find((m) => m.label === 'backstay left')!;
  const landing = nodes.get(left.path!.at(-1)!.nodeId)!;
  expect(landing.xMm).toBeCloseTo(before - 50, 6);
  // The mirrored brace lands on the mirror image of the moved node.
  const mirrored = spec.members.find((m) => m.kind === 'rear_brace' && m.id !== left.id)!;
  const far = nodes.get(mirrored.path!.at(-1)!.nodeId)!;
  expect([far.xMm, far.yMm, far.zMm]).toEqual([landing.xMm, -landing.yMm, landing.zMm]);
}, 30_000); // the rulebook is compiled in the engine's lazy chunk, slow on a busy machine

test('a sheet loaded with a model keeps its nodes and paths through an unrelated edit, and shows what the model gives', async () => {
  const spec: Specification = {
    vehicle: { classId: 'open-sprint', weightWithoutDriverKg: 635 },
    model: {
      nodes: [
        { id: 'a', role: 'foot', xMm: 0, yMm: 500, zMm: 0 },
        { id: 'b', role: 'end', xMm: -900, yMm: 500, zMm: 800 },
      ],
    },
    members: [{ id: 'rb', kind: 'rear_brace', label: 'backstay left', odMm: 38, wallMm: 2.5, material: 'mild_steel', path: [{ nodeId: 'a' }, { nodeId: 'b' }] }],
  };
  mock.on('GET', sheetPath, json(200, detail(4, spec)));
  mock.on('PUT', `${sheetPath}/specification`, json(200, detail(5, spec)));
  await openSheet();
  // Computed, not from a source: √(900² + 800²) = 1,204.2 mm long and atan(900 / 800) = 48.4° from
  // vertical; the model puts the brace on the left (y > 0).
  const shown = [...document.querySelectorAll('[data-test="model-value"]')].map((e) => e.textContent?.trim());
  expect(shown).toEqual(expect.arrayContaining(['Left', '1204 mm', '48.4°']));
  expect(document.querySelector('#in-members-0-lengthMm')).toBeNull();
  await type(document.querySelector<HTMLInputElement>('#in-members-0-wallMm')!, '3');
  await click('Save');
  expect(saved().model).toEqual(spec.model);
  expect(saved().members[0]!.path).toEqual([{ nodeId: 'a' }, { nodeId: 'b' }]);
  expect(saved().members[0]!.wallMm).toBe(3);
}, 30_000);

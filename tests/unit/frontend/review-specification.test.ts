// The steward's specification tables (issue 13 §3): members with size, material, process, length and
// bends with CLR; plates; holes; padding and welding; with a cage model (bends and lengths from the model)
// and without one (typed values), and plain empty states.
import { afterEach, describe, expect, test } from 'vitest';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import type { Specification } from '@contracts/specification';
import ReviewSpecification from '@/components/review/ReviewSpecification.vue';
import { bendsText, memberRows, plateRows } from '@/components/review/specificationRows';

const typed: Specification = {
  vehicle: { classId: 'saloon' },
  members: [
    { id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 2.413, material: 'mild_steel', process: 'dom', lengthMm: 3200, bends: [{ clrMm: 152.4 }, { clrMm: 160 }] },
    { id: 'db', kind: 'door_bar', label: 'Driver door X', odMm: 38.1, wallMm: 2.108, material: 'chromoly_4130', process: 'erw' },
  ],
  plates: [
    { id: 'p1', location: 'main_hoop_foot', memberId: 'mh', thicknessMm: 3, sidesMm: [100, 100], plateFixing: 'bolted', backingPlate: true, backingThicknessMm: 3, boltCount: 4, boltDiameterMm: 10, boltGrade: '8.8' },
    { id: 'p2', location: 'rear_brace_foot', thicknessMm: 3, areaMm2: 12000, plateFixing: 'welded' },
  ],
  inspectionHoles: [{ memberId: 'mh', diameterMm: 4.8, distanceFromWeldOrBendMm: 80 }],
  padding: { nearHelmet: true, standard: 'sfi_45_1' },
  welding: { process: 'tig' },
};

const modelled: Specification = {
  vehicle: { classId: 'saloon' },
  model: { nodes: [
    { id: 'a', label: 'Left foot', role: 'foot', xMm: 0, yMm: 500, zMm: 0 },
    { id: 'b', role: 'joint', xMm: 0, yMm: 500, zMm: 1000 },
    { id: 'c', label: 'Right foot', role: 'foot', xMm: 0, yMm: -500, zMm: 0 },
  ] } as Specification['model'],
  members: [{ id: 'mh', kind: 'main_hoop', odMm: 44.45, wallMm: 2.413, process: 'dom', path: [{ nodeId: 'a' }, { nodeId: 'b', clrMm: 140 }, { nodeId: 'c' }] }],
};

afterEach(() => {
  document.body.innerHTML = '';
});

describe('specification rows', () => {
  test('members carry size, material, process, length and bends with CLR', () => {
    const [mh, db] = memberRows(typed, 'metric');
    expect(mh).toMatchObject({ name: 'main hoop', size: '44.5 × 2.41 mm', material: 'mild steel', process: 'DOM', length: '3200 mm', bends: '2: CLR 152 mm, 160 mm' });
    expect(db).toMatchObject({ name: 'Driver door X', material: '4130 chromoly', process: 'ERW', length: '—', bends: 'none' });
    expect(memberRows(typed, 'imperial')[0]!.size).toBe('1.750 × 0.095 in');
  });

  test('with a model, bends come from the path and say so', () => {
    expect(bendsText(modelled.members[0]!, 'metric')).toBe('1: CLR 140 mm (model)');
    expect(memberRows(modelled, 'metric')[0]!.path).toBe('Left foot → b → Right foot');
  });

  test('plates: bolts and backing only for a bolted plate', () => {
    const [bolted, welded] = plateRows(typed, 'metric');
    expect(bolted).toMatchObject({ location: 'Main hoop foot', member: 'main hoop', size: '100 mm × 100 mm', fixing: 'plate bolted', backing: 'yes, 3.00 mm', bolts: '4 × 10.0 mm grade 8.8' });
    expect(welded).toMatchObject({ size: 'area 120.0 cm²', fixing: 'plate welded', backing: '—', bolts: '—' });
  });
});

describe('ReviewSpecification', () => {
  const mountSpec = (spec: Specification) => mount(ReviewSpecification, { props: { spec, units: 'metric' }, global: { plugins: [[PrimeVue, { theme: 'none' }]] } });

  test('shows every table of a typed sheet, with no path column', () => {
    const w = mountSpec(typed);
    const head = w.get('[data-test="spec-members"] thead').text();
    for (const col of ['Size (OD × wall)', 'Material', 'Process', 'Length', 'Bends']) expect(head).toContain(col);
    expect(head).not.toContain('Path through the model');
    expect(w.get('[data-test="spec-plates"]').text()).toContain('4 × 10.0 mm grade 8.8');
    expect(w.get('[data-test="spec-holes"]').text()).toContain('4.80 mm');
    expect(w.get('[data-test="spec-padding-welding"]').text()).toContain('SFI 45.1');
    expect(w.get('[data-test="spec-padding-welding"]').text()).toContain('TIG');
  });

  test('a modelled sheet shows the path; missing parts read as empty states', () => {
    const w = mountSpec(modelled);
    expect(w.get('[data-test="spec-members"] thead').text()).toContain('Path through the model');
    expect(w.text()).toContain('No mounting plates on the sheet.');
    expect(w.text()).toContain('No inspection holes on the sheet.');
    expect(w.get('[data-test="spec-padding-welding"]').text()).toContain('not given');
  });
});

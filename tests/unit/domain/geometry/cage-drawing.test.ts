// drawCage: a specification with a model becomes three SVG views whose marks and words come from the
// findings and from the model's derived facts; members without a path are left out, never guessed.
import { describe, expect, it } from 'vitest';
import { parseSpecification } from '@backend/contracts/specification';
import { drawCage, drawnMembers } from '@backend/domain/geometry/cage-drawing';
import { deriveCageGeometry } from '@backend/domain/geometry/derive';
import type { Finding } from '@backend/contracts/report';
import { sampleModelSpecification } from './sample-model';

const failing: Finding = {
  requirementId: 'brace-angle', title: 'Rear brace angle', citation: { publisher: 'Demo', rulebookTitle: 'Demo', edition: '1', section: '7.3' },
  verdict: 'fail', severity: 'mandatory', area: 'geometry', member: { id: 'rb-l', kind: 'rear_brace', index: 1 }, plate: null,
  measured: [], required: [], missing: [], reason: 'at 35° it is steeper than allowed', explanation: '',
};

describe('drawCage', () => {
  it('is drawn from a valid specification (the sample passes the contract)', () => {
    expect(parseSpecification(sampleModelSpecification()).ok).toBe(true);
  });

  it('draws every member with a path, names it as the builder did, and marks the failing backstay', () => {
    const d = drawCage({ spec: sampleModelSpecification(), findings: [failing], units: 'metric' });
    expect(d.drawn.map((m) => m.name)).toEqual(['main hoop', 'backstay left', 'backstay right', 'harness bar', 'front hoop']);
    expect(d.members.get('rb-l')).toMatchObject({ verdict: 'fail', sizeText: '38.0 × 2.00 mm', rule: '§ 7.3 Rear brace angle: at 35° it is steeper than allowed' });
    expect(d.svgs.side).toContain('data-member-id="rb-l" data-verdict="fail"');
    expect(d.svgs.side).toContain('backstay left · 38.0 × 2.00 mm · Fails a rule');
  });

  it('labels the brace angle and the drop with the derived facts, in the reader units', () => {
    const spec = sampleModelSpecification();
    const facts = deriveCageGeometry(spec as Parameters<typeof deriveCageGeometry>[0]).facts;
    const angle = facts['geometry.rearBraceAngleFromVerticalDeg']!.value;
    const drop = facts['geometry.rearBraceAttachBelowTopMm']!.value;
    const metric = drawCage({ spec, findings: [], units: 'metric' }).svgs.side;
    expect(metric).toContain(`${angle.toFixed(1)}° from vertical`);
    expect(metric).toContain(`${drop.toFixed(0)} mm below the hoop top`);
    const imperial = drawCage({ spec, findings: [], units: 'imperial' }).svgs.side;
    expect(imperial).toContain(`${(drop / 25.4).toFixed(3)} in below the hoop top`);
    expect(metric).toMatch(/helmet [\d.]+ mm below the line of the hoop tops/);
  });

  it('follows the hoop round its bends: the arc cuts the corner instead of passing through the bend node', () => {
    const hoop = drawnMembers(sampleModelSpecification()).find((m) => m.id === 'mh')!;
    expect(hoop.centreline.length).toBeGreaterThan(6);
    const corner = { x: -60, y: 470, z: 1130 };
    const nearest = Math.min(...hoop.centreline.map((p) => Math.hypot(p.x - corner.x, p.y - corner.y, p.z - corner.z)));
    // A 150 mm CLR bend of about 85° passes about CLR·(1/cos(θ/2) − 1) ≈ 55 mm inside its corner (computed).
    expect(nearest).toBeGreaterThan(30);
  });

  it('leaves out members with no path or no OD yet, and a sheet without a model draws nothing', () => {
    const spec = sampleModelSpecification();
    const draft = { ...spec, members: [...spec.members, { id: 'db', kind: 'door_bar' as const }, { ...spec.members[3]!, id: 'x', odMm: undefined }] };
    expect(drawnMembers(draft).map((m) => m.id)).toEqual(['mh', 'rb-l', 'rb-r', 'hb', 'fh']);
    expect(drawCage({ spec: { members: spec.members }, findings: [], units: 'metric' }).drawn).toEqual([]);
  });
});

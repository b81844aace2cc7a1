// A small cage as the views receive it (centrelines already sampled), with straight runs only so the
// expected page positions can be worked out by hand: a main hoop, two backstays and a harness bar.
import type { DrawnMember } from '@backend/domain/geometry/projection';

export const SAMPLE_CAGE: DrawnMember[] = [
  {
    id: 'mh', name: 'main hoop', odMm: 45,
    centreline: [{ x: 0, y: 550, z: 0 }, { x: -50, y: 450, z: 1150 }, { x: -50, y: -450, z: 1150 }, { x: 0, y: -550, z: 0 }],
  },
  { id: 'rb-l', name: 'backstay left', odMm: 38, centreline: [{ x: -50, y: 450, z: 1100 }, { x: -900, y: 450, z: 300 }] },
  { id: 'rb-r', name: 'backstay right', odMm: 38, centreline: [{ x: -50, y: -450, z: 1100 }, { x: -900, y: -450, z: 300 }] },
  { id: 'hb', name: 'harness bar', odMm: 38, centreline: [{ x: -30, y: 480, z: 600 }, { x: -30, y: -480, z: 600 }] },
];

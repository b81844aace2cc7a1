// Where the measured geometry goes on the views: the brace angle at the upper end of the steeper rear
// brace, the drop from the main hoop's top to where that brace meets it, the line joining the hoop
// tops that the helmet must stay under, the helmet and the shoulder height. Positions come from the
// drawn centrelines; the surface conversion (a hoop's top is its highest centreline point plus half
// its OD) is the one docs/geometry.md defines.
import { formatQuantity, type UnitSystem } from '../units.js';
import type { GeometryMark } from './geometry-marks.js';
import type { DrawnMember, Point3 } from './projection.js';
import type { CageSpecLike } from './cage-drawing.js';

const highest = (points: readonly Point3[]): Point3 => points.reduce((a, b) => (b.z > a.z ? b : a));

/** A straight brace's angle from the vertical, in degrees, from its two ends. */
export function angleFromVerticalDeg(a: Point3, b: Point3): number {
  const len = Math.hypot(b.x - a.x, b.y - a.y, b.z - a.z);
  return len === 0 ? 0 : (Math.acos(Math.min(1, Math.abs(b.z - a.z) / len)) * 180) / Math.PI;
}

export function cageGeometryMarks(spec: CageSpecLike, drawn: readonly DrawnMember[], units: UnitSystem): GeometryMark[] {
  const kindOf = new Map(spec.members.map((m) => [m.id, m.kind]));
  const ofKind = (...kinds: string[]) => drawn.filter((d) => kinds.includes(kindOf.get(d.id) ?? ''));
  const len = (mm: number) => formatQuantity(mm, 'length', units).text;
  const marks: GeometryMark[] = [];
  const hoop = ofKind('main_hoop')[0];
  const hoopTop = hoop ? highest(hoop.centreline) : null;

  // The rules read the smaller of the braces' angles, so the arc goes on that brace.
  const braces = ofKind('rear_brace').map((b) => {
    const first = b.centreline[0]!;
    const last = b.centreline[b.centreline.length - 1]!;
    const [upper, lower] = first.z >= last.z ? [first, last] : [last, first];
    return { b, upper, lower, angle: angleFromVerticalDeg(upper, lower) };
  });
  const brace = braces.sort((x, y) => x.angle - y.angle)[0];
  if (brace) {
    const reach = Math.hypot(brace.lower.x - brace.upper.x, brace.lower.z - brace.upper.z);
    marks.push({
      kind: 'angle', views: ['side'], vertex: brace.upper, from: { ...brace.upper, z: brace.upper.z - reach }, to: brace.lower,
      label: `${formatQuantity(brace.angle, 'angle', units).text} from vertical`,
    });
    if (hoop && hoopTop) {
      const topZ = hoopTop.z + hoop.odMm / 2;
      marks.push({ kind: 'drop', views: ['side'], top: { ...brace.upper, z: topZ }, bottom: brace.upper, label: `${len(Math.max(0, topZ - brace.upper.z))} below the hoop top` });
    }
  }
  const front = ofKind('front_hoop', 'halo_hoop')[0];
  if (hoop && hoopTop && front) {
    const frontTop = highest(front.centreline);
    marks.push({ kind: 'line', views: ['side'], a: { ...hoopTop, z: hoopTop.z + hoop.odMm / 2 }, b: { ...frontTop, z: frontTop.z + front.odMm / 2 }, label: 'line of the hoop tops' });
  }
  const helmet = spec.vehicle?.helmet;
  if (helmet) marks.push({ kind: 'sphere', views: ['side', 'top', 'front'], centre: { x: helmet.xMm, y: helmet.yMm, z: helmet.zMm }, radiusMm: helmet.radiusMm, label: 'helmet' });
  const shoulders = spec.vehicle?.driverShoulderHeightMm;
  if (shoulders !== undefined && hoop) {
    const ys = hoop.centreline.map((p) => p.y);
    const x = hoop.centreline[0]!.x;
    marks.push({ kind: 'line', views: ['front'], a: { x, y: Math.min(...ys), z: shoulders }, b: { x, y: Math.max(...ys), z: shoulders }, label: 'shoulders' });
  }
  return marks;
}

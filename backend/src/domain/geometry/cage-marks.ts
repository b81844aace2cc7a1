// Where the measured geometry goes on the views: the brace angle at the upper end of the brace the
// rules read (the smallest angle), the drop from the main hoop's top to where the lowest-attached
// brace meets it, the line joining the hoop tops that the helmet must stay under, the helmet and the
// shoulder height. Positions come from the drawn centrelines; every number in the words is the
// model's derived fact (deriveCageGeometry), so the drawing says what the rules read. A hoop's top
// is its highest centreline point plus half its OD (docs/geometry.md).
import { formatQuantity, type UnitSystem } from '../units.js';
import type { GeometryFactValues } from './derived-facts.js';
import type { GeometryMark } from './geometry-marks.js';
import type { DrawnMember, Point3 } from './projection.js';
import type { CageSpecLike } from './cage-drawing.js';

const highest = (points: readonly Point3[]): Point3 => points.reduce((a, b) => (b.z > a.z ? b : a));

function upperAndLower(d: DrawnMember): { upper: Point3; lower: Point3 } {
  const first = d.centreline[0]!;
  const last = d.centreline[d.centreline.length - 1]!;
  return first.z >= last.z ? { upper: first, lower: last } : { upper: last, lower: first };
}

export function cageGeometryMarks(spec: CageSpecLike, drawn: readonly DrawnMember[], facts: GeometryFactValues, units: UnitSystem): GeometryMark[] {
  const kindOf = new Map(spec.members.map((m) => [m.id, m.kind]));
  const ofKind = (...kinds: string[]) => drawn.filter((d) => kinds.includes(kindOf.get(d.id) ?? ''));
  const named = (name: string | undefined) => drawn.find((d) => d.name === name);
  const len = (mm: number) => formatQuantity(mm, 'length', units).text;
  const marks: GeometryMark[] = [];
  const hoop = ofKind('main_hoop')[0];
  const hoopTop = hoop ? { ...highest(hoop.centreline), z: highest(hoop.centreline).z + hoop.odMm / 2 } : null;

  const angle = facts['geometry.rearBraceAngleFromVerticalDeg'];
  const angled = angle && named(angle.members[0]);
  if (angle && angled) {
    const { upper, lower } = upperAndLower(angled);
    const reach = Math.hypot(lower.x - upper.x, lower.z - upper.z);
    marks.push({
      kind: 'angle', views: ['side'], vertex: upper, from: { ...upper, z: upper.z - reach }, to: lower,
      label: `${formatQuantity(angle.value, 'angle', units).text} from vertical`,
    });
  }
  const drop = facts['geometry.rearBraceAttachBelowTopMm'];
  const dropped = drop && named(drop.members[0]);
  if (drop && dropped && hoopTop) {
    const { upper } = upperAndLower(dropped);
    marks.push({ kind: 'drop', views: ['side'], top: { ...upper, z: hoopTop.z }, bottom: upper, label: `${len(drop.value)} below the hoop top` });
  }
  const front = ofKind('front_hoop')[0] ?? ofKind('halo_hoop')[0];
  if (hoop && hoopTop && front) {
    const frontTop = highest(front.centreline);
    const below = facts['geometry.helmetBelowHoopLineMm'];
    const words = below ? `helmet ${len(Math.abs(below.value))} ${below.value >= 0 ? 'below' : 'ABOVE'} the line of the hoop tops` : 'line of the hoop tops';
    marks.push({ kind: 'line', views: ['side'], a: hoopTop, b: { ...frontTop, z: frontTop.z + front.odMm / 2 }, label: words });
  }
  const helmet = spec.vehicle?.helmet;
  if (helmet) marks.push({ kind: 'sphere', views: ['side', 'top', 'front'], centre: { x: helmet.xMm, y: helmet.yMm, z: helmet.zMm }, radiusMm: helmet.radiusMm, label: 'helmet' });
  const shoulders = spec.vehicle?.driverShoulderHeightMm;
  if (shoulders !== undefined && hoop) {
    const ys = hoop.centreline.map((p) => p.y);
    const x = hoop.centreline[0]!.x;
    const bar = facts['geometry.harnessBarBelowShouldersMm'];
    const words = bar ? `shoulders (harness bar ${len(Math.abs(bar.value))} ${bar.value >= 0 ? 'below' : 'above'})` : 'shoulders';
    marks.push({ kind: 'line', views: ['front'], a: { x, y: Math.min(...ys), z: shoulders }, b: { x, y: Math.max(...ys), z: shoulders }, label: words });
  }
  return marks;
}

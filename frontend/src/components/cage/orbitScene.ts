// The three.js scene of the orbiting 3D view, built from the drawing the SVG views already use (the
// same centrelines, ODs and verdict marks); it computes no geometry of its own. The model frame is
// z up, so the camera's up is z. Each tube carries its verdict's dash pattern as a striped texture
// along its length and its symbol on a sprite, so colour is never the only cue here either.
import * as THREE from 'three';
import type { CageDrawing } from '@domain/geometry/cage-drawing';
import { VERDICT_MARKS, type MarkVerdict } from '@domain/geometry/verdict-marks';

function stripeTexture(verdict: MarkVerdict): THREE.CanvasTexture {
  const mark = VERDICT_MARKS[verdict];
  const canvas = document.createElement('canvas');
  canvas.width = 64;
  canvas.height = 4;
  const ctx = canvas.getContext('2d')!;
  ctx.fillStyle = mark.tint;
  ctx.fillRect(0, 0, 64, 4);
  const total = mark.dashPerOd.reduce((a, b) => a + b, 0);
  ctx.fillStyle = mark.colour;
  if (total === 0) {
    if (verdict !== 'unchecked') ctx.fillRect(0, 1, 64, 2);
  } else {
    let x = 0;
    mark.dashPerOd.forEach((d, i) => {
      const w = (d / total) * 64;
      if (i % 2 === 0) ctx.fillRect(x, 0, Math.max(w, 2), 4);
      x += w;
    });
  }
  const texture = new THREE.CanvasTexture(canvas);
  texture.wrapS = THREE.RepeatWrapping;
  texture.colorSpace = THREE.SRGBColorSpace;
  return texture;
}

function symbolTexture(verdict: MarkVerdict): THREE.CanvasTexture | null {
  const mark = VERDICT_MARKS[verdict];
  if (mark.symbol === 'none') return null;
  const canvas = document.createElement('canvas');
  canvas.width = canvas.height = 64;
  const ctx = canvas.getContext('2d')!;
  ctx.fillStyle = '#ffffff';
  ctx.strokeStyle = mark.colour;
  ctx.lineWidth = 6;
  ctx.beginPath();
  ctx.arc(32, 32, 26, 0, Math.PI * 2);
  ctx.fill();
  ctx.stroke();
  ctx.lineCap = 'round';
  ctx.lineWidth = 7;
  ctx.beginPath();
  if (mark.symbol === 'cross') {
    ctx.moveTo(20, 20); ctx.lineTo(44, 44); ctx.moveTo(44, 20); ctx.lineTo(20, 44);
    ctx.stroke();
  } else if (mark.symbol === 'tick') {
    ctx.moveTo(19, 33); ctx.lineTo(29, 43); ctx.lineTo(45, 22);
    ctx.stroke();
  } else {
    ctx.fillStyle = mark.colour;
    ctx.font = 'bold 34px "Noto Sans", sans-serif';
    ctx.textAlign = 'center';
    ctx.textBaseline = 'middle';
    ctx.fillText(mark.symbol === 'question' ? '?' : 'W', 32, 34);
  }
  const texture = new THREE.CanvasTexture(canvas);
  texture.colorSpace = THREE.SRGBColorSpace;
  return texture;
}

/** "front" on the floor beside the arrow, in the page's font. */
function frontLabel(): THREE.Sprite {
  const canvas = document.createElement('canvas');
  canvas.width = 256;
  canvas.height = 64;
  const ctx = canvas.getContext('2d')!;
  ctx.fillStyle = '#1d2327';
  ctx.font = '600 40px "Noto Sans", sans-serif';
  ctx.textAlign = 'center';
  ctx.textBaseline = 'middle';
  ctx.fillText('front', 128, 34);
  const texture = new THREE.CanvasTexture(canvas);
  texture.colorSpace = THREE.SRGBColorSpace;
  return new THREE.Sprite(new THREE.SpriteMaterial({ map: texture, depthTest: false }));
}

export interface OrbitScene {
  scene: THREE.Scene;
  /** Tube meshes by member id, for picking. */
  meshes: Map<string, THREE.Mesh>;
  centre: THREE.Vector3;
  radiusMm: number;
  dispose(): void;
}

export function buildOrbitScene(drawing: CageDrawing, selectedId: string | null): OrbitScene {
  const scene = new THREE.Scene();
  scene.background = new THREE.Color('#ffffff');
  scene.add(new THREE.HemisphereLight('#ffffff', '#8a939b', 2.2));
  const sun = new THREE.DirectionalLight('#ffffff', 1.6);
  sun.position.set(1500, 2500, 3000);
  scene.add(sun);
  const meshes = new Map<string, THREE.Mesh>();
  const box = new THREE.Box3();
  const disposables: { dispose(): void }[] = [];
  const textures = new Map<MarkVerdict, THREE.CanvasTexture | null>();
  for (const d of drawing.drawn) {
    const info = drawing.members.get(d.id);
    const verdict = info?.verdict ?? 'unchecked';
    const path = new THREE.CurvePath<THREE.Vector3>();
    const pts = d.centreline.map((p) => new THREE.Vector3(p.x, p.y, p.z));
    let lengthMm = 0;
    for (let i = 1; i < pts.length; i += 1) {
      path.add(new THREE.LineCurve3(pts[i - 1]!, pts[i]!));
      lengthMm += pts[i]!.distanceTo(pts[i - 1]!);
    }
    const geometry = new THREE.TubeGeometry(path, Math.max(8, pts.length * 4), d.odMm / 2, 12, false);
    const stripes = stripeTexture(verdict);
    const period = d.odMm * Math.max(VERDICT_MARKS[verdict].dashPerOd.reduce((a, b) => a + b, 0), 2.4);
    stripes.repeat.set(lengthMm / period, 1);
    const material = new THREE.MeshStandardMaterial({ map: stripes, roughness: 0.6, metalness: 0.1, emissive: d.id === selectedId ? new THREE.Color('#f2b705') : new THREE.Color('#000000'), emissiveIntensity: 0.5 });
    const mesh = new THREE.Mesh(geometry, material);
    mesh.userData.memberId = d.id;
    scene.add(mesh);
    meshes.set(d.id, mesh);
    disposables.push(geometry, material, stripes);
    for (const p of pts) box.expandByPoint(p);
    if (!textures.has(verdict)) textures.set(verdict, symbolTexture(verdict));
    const symbol = textures.get(verdict);
    if (symbol) {
      const sprite = new THREE.Sprite(new THREE.SpriteMaterial({ map: symbol, depthTest: false }));
      const mid = pts[Math.floor(pts.length / 2)]!.clone().add(pts[Math.max(0, Math.floor(pts.length / 2) - 1)]!).multiplyScalar(0.5);
      sprite.position.copy(mid);
      sprite.scale.setScalar(Math.max(d.odMm * 2, 60));
      sprite.userData.memberId = d.id;
      scene.add(sprite);
      disposables.push(sprite.material);
    }
  }
  for (const t of textures.values()) if (t) disposables.push(t);
  const grid = new THREE.GridHelper(4000, 16, '#b8c0c7', '#e1e5e8');
  grid.rotation.x = Math.PI / 2; // the floor is the model's x-y plane
  scene.add(grid);
  disposables.push(grid.geometry, grid.material as THREE.Material);
  // Which way is forward (+x), since a cage seen from above its middle reads either way round.
  const ahead = box.isEmpty() ? 0 : box.max.x + 200;
  const front = new THREE.ArrowHelper(new THREE.Vector3(1, 0, 0), new THREE.Vector3(ahead, 0, 2), 700, '#1d2327', 200, 120);
  scene.add(front);
  disposables.push(front.line.geometry, front.line.material as THREE.Material, front.cone.geometry, front.cone.material as THREE.Material);
  const label = frontLabel();
  label.position.set(ahead + 1050, 0, 120);
  label.scale.set(640, 160, 1);
  scene.add(label);
  disposables.push(label.material.map!, label.material);
  const centre = box.isEmpty() ? new THREE.Vector3(0, 0, 600) : box.getCenter(new THREE.Vector3());
  const radiusMm = box.isEmpty() ? 1500 : Math.max(box.getSize(new THREE.Vector3()).length() / 2, 400);
  return { scene, meshes, centre, radiusMm, dispose: () => disposables.forEach((x) => x.dispose()) };
}

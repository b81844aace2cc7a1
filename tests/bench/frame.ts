// The real frame after an edit, in the browser: the built front end served from a fresh seeded
// database, the demo builder's sheet holding the 40-member bench cage (tests/bench/drawing.ts), and
// Debian's Chromium driven by playwright-core. Each edit types a node's height into the node table,
// as a builder does; the time runs from the input event to the end of the layout that follows Vue's
// update (derive, three SVG views, the member rows and the cut list), measured with the page's own
// clock. Printed beside the same measurement for an input that changes nothing (the bare cost of
// an input event and a layout), taken in the same run, as a ratio. Paint and raster happen off the
// main thread and are left out; the time to the next animation frame is reported too.
// FRAME_PROFILE=1 also prints the page's busiest functions during the edits (a CPU profile through CDP),
// FRAME_TRACE=1 the browser's own phases per edit (style, layout, paint, hit testing: a CDP trace).
// Run alone: `npx tsx --tsconfig tsconfig.json tests/bench/frame.ts` (needs the test cluster's port).
import { once } from 'node:events';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { freshSeededDatabase } from './bench-db';
import { benchModel } from './drawing';

export const MAX_FRAME_MS = 16;

const root = fileURLToPath(new URL('../..', import.meta.url));
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

export interface FrameBenchResult {
  members: number;
  /** Median, input event to layout done after one node moved. */
  editMs: number;
  /** Of which the page's script (Vue's update, derive, SVG strings), before layout. */
  scriptMs: number;
  /** The same for an input that changes nothing. */
  baselineMs: number;
  ratio: number;
  /** Median, input event to the next animation frame after the edit. */
  toNextFrameMs: number;
}

export async function runFrameBench(options: { edits?: number; log?: boolean } = {}): Promise<FrameBenchResult> {
  const { edits = 40, log = false } = options;
  if (!existsSync(`${root}frontend/dist/index.html`)) execFileSync('npx', ['vite', 'build', '--config', 'frontend/vite.config.ts'], { cwd: root, stdio: 'ignore' });
  const { url, ds } = await freshSeededDatabase('cagewright_bench_frame', 4);
  const { createApp, closeApp } = await import('../../backend/src/app');
  const { loadConfig } = await import('../../backend/src/config');
  const { User, Club, Rulebook, RulesetVersion } = await import('../../backend/src/entities');
  const { createGarageService } = await import('../../backend/src/services/garage.service');
  const { createBuildSheetService } = await import('../../backend/src/services/build-sheets.service');
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: url, PUBLIC_URL: 'http://127.0.0.1', LOG_LEVEL: 'warn' });
  const app = createApp({ dataSource: ds, config, pruneSessions: false });
  const server = app.listen(0, '127.0.0.1');
  await once(server, 'listening');
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const profile = mkdtempSync(join(tmpdir(), 'cagewright-frame-'));
  try {
    // The demo builder's sheet with the bench cage, in the hillclimb class (metric on the wire).
    const builder = await ds.getRepository(User).findOneByOrFail({ email: 'builder@tarnwick.example' });
    const club = await ds.getRepository(Club).findOneByOrFail({});
    const book = await ds.getRepository(Rulebook).findOneByOrFail({ clubId: club.id, slug: 'tarnwick-vale-mc-hillclimb-2027-metric' });
    const version = await ds.getRepository(RulesetVersion).findOneByOrFail({ rulebookId: book.id, status: 'published' });
    const spec = benchModel();
    spec.vehicle.classId = 'hill-saloon';
    const car = await createGarageService(ds).create(builder.id, { name: 'Bench cage', chassisType: 'tube_frame' });
    const sheet = await createBuildSheetService(ds).create(car.id, builder.id, { name: 'Forty tubes', clubId: club.id, rulesetVersionId: version.id, classId: 'hill-saloon', specification: spec });

    const context = await chromium.launchPersistentContext(profile, {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      viewport: { width: 1280, height: 800 },
    });
    try {
      const page = context.pages()[0] ?? (await context.newPage());
      await page.goto(`${base}/sign-in`);
      await page.getByLabel('E-mail').fill('builder@tarnwick.example');
      await page.getByLabel('Password').fill('cagewright-demo');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('navigation', { name: 'Main' }).waitFor();
      await page.goto(`${base}/build-sheets/${sheet.buildSheet.id}`);
      await page.locator('[data-view="side"] svg[role="img"]').waitFor();
      await page.locator('summary', { hasText: 'Cage model' }).first().click();
      const members = await page.locator('[data-view="side"] g[data-verdict]').count();
      const index = spec.model!.nodes.findIndex((n) => n.id === 'a3');

      /** One typed value, timed in the page: input event → Vue's update → layout (→ the next frame). */
      const time = (selector: string, text: string) =>
        page.evaluate(async ({ selector, text }) => {
          const input = document.querySelector<HTMLInputElement>(selector)!;
          const view = document.querySelector('[data-view="side"]')!;
          const before = view.innerHTML;
          const t0 = performance.now();
          input.value = text;
          input.dispatchEvent(new Event('input', { bubbles: true }));
          await new Promise((r) => setTimeout(r, 0)); // Vue flushes its update in a microtask before this
          const script = performance.now() - t0;
          void document.documentElement.offsetHeight; // the layout the update needs
          const work = performance.now() - t0;
          await new Promise((r) => requestAnimationFrame(() => r(null)));
          const frame = performance.now() - t0;
          return { work, script, frame, redrawn: view.innerHTML !== before };
        }, { selector, text });

      const node = `#in-model-nodes-${index}-zMm`;
      // As a builder does: click into the field, then type; the pointer stays where it clicked.
      await page.locator(node).click();
      const start = Number(await page.locator(node).inputValue());
      const label = '#in-members-0-label';
      const same = await page.locator(label).inputValue();
      const cdp = process.env.FRAME_PROFILE ? await context.newCDPSession(page) : null;
      if (cdp) {
        await cdp.send('Profiler.enable');
        await cdp.send('Profiler.start');
      }
      const trace: { name: string; dur?: number; ph: string }[] = [];
      const tracer = process.env.FRAME_TRACE ? await context.newCDPSession(page) : null;
      if (tracer) {
        tracer.on('Tracing.dataCollected', (e) => trace.push(...(e.value as unknown as typeof trace)));
        await tracer.send('Tracing.start', { categories: 'devtools.timeline,blink', transferMode: 'ReportEvents' });
      }
      const editTimes: number[] = [];
      const frames: number[] = [];
      const scripts: number[] = [];
      const bare: number[] = [];
      for (let i = 0; i < edits + 5; i++) {
        // 1 mm up and back, typed in the builder's units (a node of the bench cage stays a valid tube).
        const r = await time(node, (start + (i % 2 ? 0 : 1 / 25.4)).toFixed(4));
        const b = await time(label, same);
        // An honest bench: the edit must have redrawn the view, and the unchanged input must not.
        if (!r.redrawn) throw new Error('moving the node did not redraw the side view');
        if (b.redrawn) throw new Error('an unchanged input redrew the side view');
        if (i < 5) continue; // warm-up: the JIT and the first layouts settle first
        editTimes.push(r.work);
        frames.push(r.frame);
        scripts.push(r.script);
        bare.push(b.work);
      }
      if (cdp) {
        const { profile } = (await cdp.send('Profiler.stop')) as { profile: { nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number } ; hitCount?: number }[]; samples: number[]; timeDeltas: number[] } };
        const self = new Map<string, number>();
        const byId = new Map(profile.nodes.map((n) => [n.id, n]));
        profile.samples.forEach((id, i) => {
          const n = byId.get(id)!;
          const key = `${n.callFrame.functionName || '(anon)'} ${n.callFrame.url.split('/').pop()}:${n.callFrame.lineNumber}`;
          self.set(key, (self.get(key) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
        });
        console.log([...self.entries()].sort((a, b) => b[1] - a[1]).slice(0, 40).map(([k, v]) => `${v.toFixed(1)} ms  ${k}`).join('\n'));
      }
      if (tracer) {
        const done = new Promise((r) => tracer.once('Tracing.tracingComplete', r));
        await tracer.send('Tracing.end');
        await done;
        const by = new Map<string, number>();
        for (const e of trace) if (e.ph === 'X' && e.dur) by.set(e.name, (by.get(e.name) ?? 0) + e.dur / 1000);
        console.log([...by.entries()].sort((a, b) => b[1] - a[1]).slice(0, 25).map(([k, v]) => `${(v / (edits + 5)).toFixed(2)} ms/edit  ${k}`).join('\n'));
      }
      const editMs = median(editTimes);
      const baselineMs = Math.max(median(bare), 0.01);
      const result = { members, editMs, scriptMs: median(scripts), baselineMs, ratio: editMs / baselineMs, toNextFrameMs: median(frames) };
      if (log) console.log(`frame bench: ${members} tubes drawn; edit ${editMs.toFixed(2)} ms (script ${result.scriptMs.toFixed(2)} ms, next frame ${result.toNextFrameMs.toFixed(1)} ms), unchanged input ${baselineMs.toFixed(2)} ms`);
      return result;
    } finally {
      await context.close();
    }
  } finally {
    rmSync(profile, { recursive: true, force: true });
    await closeApp(app);
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await ds.destroy();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  runFrameBench({ log: true }).then(
    (r) => console.log(JSON.stringify(r)),
    (e: unknown) => {
      console.error(e);
      process.exitCode = 1;
    },
  );
}

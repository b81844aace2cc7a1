// First-load JavaScript per route, gzipped, from the built front end (frontend/dist and Vite's
// manifest): the entry with everything it imports statically, plus the route's own view (and the
// signed-in shell for routes inside it). Lazy chunks (another route, the 3D view) are not counted,
// since the page does not load them until asked. Builds the front end first when there is no manifest.
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const root = fileURLToPath(new URL('../../', import.meta.url));
const dist = `${root}frontend/dist/`;
export const MAX_ROUTE_GZIP_KB = 200;

interface ManifestChunk {
  file: string;
  imports?: string[];
  dynamicImports?: string[];
  isEntry?: boolean;
}

export const ROUTES: Readonly<Record<string, readonly string[]>> = {
  'sign-in page': ['src/views/SignInView.vue'],
  'build sheet page': ['src/layout/AppLayout.vue', 'src/views/BuildSheetView.vue'],
};

export interface RouteBundle {
  route: string;
  gzipKb: number;
  files: string[];
  /** Lazy chunks this route can load later (the 3D view; other routes' views are left out), gzipped. */
  lazy: { file: string; gzipKb: number }[];
}

function manifest(): Record<string, ManifestChunk> {
  const path = `${dist}.vite/manifest.json`;
  if (!existsSync(path)) execFileSync('npx', ['vite', 'build', '--config', 'frontend/vite.config.ts'], { cwd: root, stdio: 'ignore' });
  return JSON.parse(readFileSync(path, 'utf8')) as Record<string, ManifestChunk>;
}

const gzipKb = (file: string) => gzipSync(readFileSync(`${dist}${file}`), { level: 9 }).length / 1024;

export function routeBundles(): RouteBundle[] {
  const m = manifest();
  const entry = Object.keys(m).find((k) => m[k]!.isEntry)!;
  return Object.entries(ROUTES).map(([route, views]) => {
    const seen = new Set<string>();
    const walk = (key: string) => {
      if (seen.has(key) || !m[key]) return;
      seen.add(key);
      for (const dep of m[key]!.imports ?? []) walk(dep);
    };
    for (const key of [entry, ...views]) {
      if (!m[key]) throw new Error(`${key} is not in the build manifest`);
      walk(key);
    }
    const files = [...seen].map((k) => m[k]!.file).filter((f) => f.endsWith('.js'));
    const lazyKeys = new Set([...seen].flatMap((k) => m[k]!.dynamicImports ?? []).filter((k) => !seen.has(k) && !k.startsWith('src/views/') && !k.startsWith('src/layout/')));
    const lazy = [...lazyKeys].map((k) => ({ file: m[k]!.file, gzipKb: gzipKb(m[k]!.file) }));
    return { route, gzipKb: files.reduce((sum, f) => sum + gzipKb(f), 0), files, lazy };
  });
}

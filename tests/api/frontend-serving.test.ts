// The production front-end build is served with an SPA fallback, without swallowing /api routes.
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { errorBody, makeTestApp, useTestDatabase } from './helpers';

const db = useTestDatabase();

function fakeBuild(): string {
  const dist = mkdtempSync(join(tmpdir(), 'cw-dist-'));
  mkdirSync(join(dist, 'assets'));
  writeFileSync(join(dist, 'index.html'), '<!doctype html><title>Cagewright</title><div id="app"></div>');
  writeFileSync(join(dist, 'assets', 'main-abc123.js'), 'console.log("cagewright")');
  return dist;
}

describe('front-end build', () => {
  it('serves assets, falls back to index.html for app routes, and keeps /api JSON', async () => {
    const app = makeTestApp(db.ds, { frontendDist: fakeBuild() });
    const asset = await request(app).get('/assets/main-abc123.js').expect(200);
    expect(asset.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    for (const path of ['/', '/clubs/tarnwick-vale/members', '/invitations/abc']) {
      const page = await request(app).get(path).expect(200).expect('Content-Type', /html/);
      expect(page.text).toContain('<div id="app">');
      expect(page.headers['cache-control']).toBe('no-cache');
    }
    // Files that are not in the build are 404s, not the app page.
    for (const path of ['/assets/main-abc123.js.map', '/assets/old-chunk-9f8e7d.js', '/favicon.ico', '/robots.txt']) {
      const missing = await request(app).get(path).expect(404);
      expect(missing.text).not.toContain('<div id="app">');
    }
    const api = await request(app).get('/api/not-a-route').expect(404);
    expect(api.body).toEqual(errorBody({ error: { code: 'not_found', message: 'No such API route.' } }));
  });

  it('has no fallback when there is no build', async () => {
    await request(makeTestApp(db.ds, { frontendDist: null })).get('/clubs').expect(404);
  });
});

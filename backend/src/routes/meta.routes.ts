// GET /api/meta: what the front end needs to know about this server before anyone signs in.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { Router } from 'express';
import { projectRoot } from '../config';
import type { MetaWire } from '../contracts/mail';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

/** The app's version, from package.json. */
export const appVersion = (
  JSON.parse(readFileSync(resolve(projectRoot, 'package.json'), 'utf8')) as { version: string }
).version;

export function createMetaRouter({ mailboxEnabled }: { mailboxEnabled: boolean }): RouteTableRouter {
  const meta: MetaWire = { mailboxEnabled, version: appVersion };
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/meta',
      access: 'public',
      handler: ({ res }) => {
        res.json(meta);
      },
    }),
  ]);
}

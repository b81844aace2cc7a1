// The development mailbox (docs/api.md, "Development mailbox"): what the local fake SMTP server caught.
// Mounted only while FAKE_SMTP is on, so with it off every address here is the ordinary JSON 404.
// It shows every club's mail, so it is for admins (of any club) only: the access policy's `anyClub.admin`.
import { Router } from 'express';
import { mailboxParamsSchema } from '../contracts/mail';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createMailboxRouter({ services }: { services: Services }): RouteTableRouter {
  const { mailbox } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/dev/mailbox',
      access: 'anyClub.admin',
      handler: async ({ res }) => {
        res.json({ messages: await mailbox.list() });
      },
    }),
    route({
      method: 'get',
      path: '/dev/mailbox/:id',
      access: 'anyClub.admin',
      params: mailboxParamsSchema,
      handler: async ({ res, params }) => {
        res.json({ message: await mailbox.get(params.id) });
      },
    }),
    route({
      method: 'delete',
      path: '/dev/mailbox',
      access: 'anyClub.admin',
      handler: async ({ res }) => {
        await mailbox.clear();
        res.status(204).end();
      },
    }),
  ]);
}

// The development mailbox (docs/api.md, "Development mailbox"): what the local fake SMTP server caught.
// Mounted only while FAKE_SMTP is on, so with it off every address here is the ordinary JSON 404.
// It shows every club's mail, so it is for admins (of any club) only.
import { Router, type NextFunction, type Request, type Response } from 'express';
import { mailboxParamsSchema } from '../contracts/mail';
import { ForbiddenError } from '../errors';
import { servicesOf, signedInUserId, type Guard } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route } from './route-table';

const adminOfAnyClub: Guard = Object.assign(
  (req: Request, _res: Response, next: NextFunction) => {
    Promise.resolve()
      .then(async () => {
        if (!(await servicesOf(req).mailbox.isAdminOfAnyClub(signedInUserId(req))))
          throw new ForbiddenError();
      })
      .then(() => next(), next);
  },
  { guardName: 'adminOfAnyClub' },
);

export function createMailboxRouter({ services }: { services: Services }): Router {
  const { mailbox } = services;
  return mountRoutes(Router(), [
    route({
      method: 'get',
      path: '/dev/mailbox',
      guards: [adminOfAnyClub],
      handler: async ({ res }) => {
        res.json({ messages: await mailbox.list() });
      },
    }),
    route({
      method: 'get',
      path: '/dev/mailbox/:id',
      guards: [adminOfAnyClub],
      params: mailboxParamsSchema,
      handler: async ({ res, params }) => {
        res.json({ message: await mailbox.get(params.id) });
      },
    }),
    route({
      method: 'delete',
      path: '/dev/mailbox',
      guards: [adminOfAnyClub],
      handler: async ({ res }) => {
        await mailbox.clear();
        res.status(204).end();
      },
    }),
  ]);
}

// Selling a car (docs/api.md, "Selling a car"): the seller's offer, the buyer's answer, the seller's
// withdrawal, the caller's open offers both ways; and a club admin's list of the club's cars and outright move.
import { Router } from 'express';
import { adminTransferBodySchema, clubCarParamsSchema, offerCarBodySchema, transferParamsSchema } from '../contracts/car-transfers';
import { clubParamsSchema } from '../contracts/clubs';
import { carParamsSchema } from '../contracts/garage';
import { signedInUserId } from '../middleware/guards';
import type { Services } from '../services';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

export function createCarTransfersRouter({ services }: { services: Services }): RouteTableRouter {
  const { carTransfers } = services;
  return mountRoutes(Router(), [
    route({
      method: 'post', path: '/cars/:carId/transfer-offers', access: 'car.owner', params: carParamsSchema, body: offerCarBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json({ transfer: await carTransfers.offer(params.carId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'get', path: '/car-transfers', access: 'signedIn',
      handler: async ({ req, res }) => {
        res.json(await carTransfers.list(signedInUserId(req)));
      },
    }),
    route({
      method: 'post', path: '/car-transfers/:transferId/accept', access: 'transfer.recipient', params: transferParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ transfer: await carTransfers.accept(params.transferId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/car-transfers/:transferId/decline', access: 'transfer.recipient', params: transferParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ transfer: await carTransfers.decline(params.transferId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/car-transfers/:transferId/withdraw', access: 'transfer.sender', params: transferParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ transfer: await carTransfers.withdraw(params.transferId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'get', path: '/clubs/:clubId/cars', access: 'club.admin', params: clubParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ cars: await carTransfers.clubCars(params.clubId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/clubs/:clubId/cars/:carId/transfer', access: 'club.admin', params: clubCarParamsSchema, body: adminTransferBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ transfer: await carTransfers.adminTransfer(params.clubId, params.carId, signedInUserId(req), body) });
      },
    }),
  ]);
}

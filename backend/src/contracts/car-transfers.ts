// Wire contracts of car transfers (docs/api.md, "Selling a car"): the seller offers a car by the buyer's
// e-mail address, the buyer accepts or declines, the seller withdraws; a club admin moves a car of the
// club to another member outright and lists the club's cars to do it.
import { z } from 'zod';
import { emailSchema, uuidSchema } from './common';

export const offerCarBodySchema = z.object({ email: emailSchema }).strict();
export type OfferCarBody = z.infer<typeof offerCarBodySchema>;

export const transferParamsSchema = z.object({ transferId: uuidSchema });
export const clubCarParamsSchema = z.object({ clubId: uuidSchema, carId: uuidSchema });

export const adminTransferBodySchema = z.object({ toUserId: uuidSchema }).strict();
export type AdminTransferBody = z.infer<typeof adminTransferBodySchema>;

export type CarTransferStateWire = 'offered' | 'accepted' | 'declined' | 'withdrawn' | 'cancelled' | 'transferred';

export interface TransferPersonWire {
  id: string;
  displayName: string;
  email: string;
}

export interface CarTransferWire {
  id: string;
  state: CarTransferStateWire;
  car: { id: string; name: string; make: string | null; model: string | null; year: number | null; raceNumber: string | null; sheets: number; records: number };
  from: TransferPersonWire;
  to: TransferPersonWire;
  createdAt: string;
  decidedAt: string | null;
}

export interface CarTransfersWire {
  /** Offers made to the caller, still open. */
  incoming: CarTransferWire[];
  /** Offers the caller made, still open. */
  outgoing: CarTransferWire[];
}

export interface ClubCarWire {
  id: string;
  name: string;
  make: string | null;
  model: string | null;
  raceNumber: string | null;
  owner: TransferPersonWire;
  /** Build sheets the car has in this club. */
  sheets: number;
  /** An offer the owner has made and the buyer has not answered. */
  openOffer: boolean;
}

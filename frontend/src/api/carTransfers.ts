// Selling a car (docs/api.md, "Selling a car"): offers between two people, and a club admin's move.
import { http } from './http';
import type { CarTransfersWire, CarTransferWire, ClubCarWire } from '@contracts/car-transfers';

export type { CarTransferWire as CarTransfer, CarTransfersWire as CarTransfers, ClubCarWire as ClubCar } from '@contracts/car-transfers';

const id = encodeURIComponent;

export async function offerCar(carId: string, email: string): Promise<CarTransferWire> {
  return (await http.post<{ transfer: CarTransferWire }>(`/cars/${id(carId)}/transfer-offers`, { email })).transfer;
}

export function listTransfers(): Promise<CarTransfersWire> {
  return http.get<CarTransfersWire>('/car-transfers');
}

export async function answerTransfer(transferId: string, answer: 'accept' | 'decline' | 'withdraw'): Promise<CarTransferWire> {
  return (await http.post<{ transfer: CarTransferWire }>(`/car-transfers/${id(transferId)}/${answer}`)).transfer;
}

export async function clubCars(clubId: string): Promise<ClubCarWire[]> {
  return (await http.get<{ cars: ClubCarWire[] }>(`/clubs/${id(clubId)}/cars`)).cars;
}

export async function moveCar(clubId: string, carId: string, toUserId: string): Promise<CarTransferWire> {
  return (await http.post<{ transfer: CarTransferWire }>(`/clubs/${id(clubId)}/cars/${id(carId)}/transfer`, { toUserId })).transfer;
}

// Invented garage data for front-end tests, shaped like the garage contract's wire types.
import type { BuildSheetDetail, Car, SheetEditions } from '@/api/garage';
import document from '../../../rulesets/tarnwick-vale-mc-cage-regulations-2027.json';
import { tarnwick } from './fixtures';

export const versionId = '7e57e57e-0000-4000-8000-000000000001';
export const sheetId = '5ee75ee7-0000-4000-8000-000000000001';
export const carId = 'ca5ca5ca-0000-4000-8000-000000000001';
export const IN = 25.4; // F-UNIT-1: exact

export const versionBody = {
  version: {
    id: versionId,
    classes: [
      { id: 'open-sprint', name: 'Open Sprint (roll bar)', weightBasis: 'without_driver' },
      { id: 'club-saloon', name: 'Club Saloon (full cage)', weightBasis: 'with_driver' },
    ],
    document,
  },
};

export function car(overrides: Partial<Car> = {}): Car {
  return {
    id: carId, name: 'Grey hatch', make: 'Invented', model: 'Mk2', year: 1991, chassisType: 'unibody', raceNumber: '27',
    archivedAt: null, createdAt: '2026-11-01T10:00:00Z', updatedAt: '2026-11-01T10:00:00Z', buildSheets: [], ...overrides,
  };
}

export function sheetDetail(revision: number, wallIn = 0.065): BuildSheetDetail {
  return {
    buildSheet: {
      id: sheetId, name: 'Sprint 2027', car: { id: carId, name: 'Grey hatch', make: null, model: null, year: null, raceNumber: '27', chassisType: 'unibody' },
      owner: { id: 'a0000000-0000-4000-8000-00000000000a', displayName: 'Pat Hollis' }, club: { id: tarnwick.id, name: tarnwick.name },
      rulebook: { id: 'b', title: 'Tarnwick Vale MC Cage Regulations', edition: '2027', publisher: 'Tarnwick Vale Motor Club' },
      rulesetVersionId: versionId, classId: 'open-sprint', currentRevision: revision, archivedAt: null, latestCheckRunId: null,
      latestVerdict: null, latestCheckedRevision: null, createdAt: '2026-11-01T10:00:00Z', updatedAt: '2026-11-01T10:00:00Z',
    },
    revision: {
      number: revision, rulesetVersionId: versionId, classId: 'open-sprint', memberCount: 1, createdAt: '2026-11-01T10:00:00Z', createdBy: null,
      specification: {
        vehicle: { classId: 'open-sprint', weightWithoutDriverKg: 635 },
        members: [{ id: 'mh', kind: 'main_hoop', odMm: 1.625 * IN, wallMm: wallIn * IN, material: 'mild_steel', process: 'dom' }],
      },
    },
    tubeData: { members: [], cutList: [], estimatedTubeMassKg: 0, massComplete: false, membersWithoutLength: ['mh'], namesWithoutLength: ['Main hoop'] },
    access: 'owner',
  };
}

/** The sheet's rulebook has no edition newer than the sheet's own. */
export const noNewerEdition: { editions: SheetEditions } = {
  editions: {
    pinned: { versionId, versionNumber: 1, edition: '2027', status: 'published', effectiveDate: '2026-11-01' },
    inForce: null,
    newer: null,
    rulebookTitle: 'Tarnwick Vale MC Cage Regulations',
  },
};

// A builder's fabrication settings (bender dies and springback, trim allowance, stick length, kerf),
// calibrated once and used by every sheet. Until a builder saves their own, the defaults follow their
// preferred units (a 6 m or a 20 ft stick). Writes arrive validated, so a refused change never
// touches what was saved.
import type { DataSource } from 'typeorm';
import type { FabricationSettings, FabricationSettingsWire } from '../contracts/fabrication';
import { DEFAULT_KERF_MM, DEFAULT_STICK_MM } from '../domain/fabrication/nesting';
import type { FabricationSettingsInput } from '../domain/fabrication/sheet-fabrication';

/** A few millimetres per end to dress the fit, as is common practice. */
export const DEFAULT_TRIM_ALLOWANCE_MM = 3;

export type { FabricationSettingsWire };

export interface FabricationSettingsService {
  get(userId: string): Promise<FabricationSettingsWire>;
  put(userId: string, settings: FabricationSettings): Promise<FabricationSettingsWire>;
}

export function asDomainSettings(s: FabricationSettings): FabricationSettingsInput {
  return { dies: s.dies.map((d) => ({ name: d.name, clrMm: d.clrMm, calibration: { setDeg: d.setDeg, heldDeg: d.heldDeg } })), trimAllowanceMm: s.trimAllowanceMm, stickLengthMm: s.stickLengthMm, kerfMm: s.kerfMm };
}

export function createFabricationSettingsService(ds: DataSource): FabricationSettingsService {
  async function defaults(userId: string): Promise<FabricationSettingsWire> {
    const rows: { preferred_units: 'imperial' | 'metric' }[] = await ds.query('SELECT preferred_units FROM users WHERE id = $1', [userId]);
    const units = rows[0]?.preferred_units ?? 'metric';
    return { dies: [], trimAllowanceMm: DEFAULT_TRIM_ALLOWANCE_MM, stickLengthMm: DEFAULT_STICK_MM[units], kerfMm: DEFAULT_KERF_MM, saved: false };
  }
  return {
    async get(userId) {
      const rows: { settings: FabricationSettings }[] = await ds.query('SELECT settings FROM fabrication_settings WHERE user_id = $1', [userId]);
      return rows[0] ? { ...rows[0].settings, saved: true } : defaults(userId);
    },
    async put(userId, settings) {
      await ds.query(
        `INSERT INTO fabrication_settings (user_id, settings, updated_at) VALUES ($1, $2::jsonb, now())
         ON CONFLICT (user_id) DO UPDATE SET settings = EXCLUDED.settings, updated_at = now()`,
        [userId, JSON.stringify(settings)],
      );
      return { ...settings, saved: true };
    },
  };
}

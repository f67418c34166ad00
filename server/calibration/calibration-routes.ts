import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { findActiveCalibration, listCalibrations } from './calibration-repository.js';

/** `GET /api/calibrations` → `{ calibrations: [...] }` (oldest first); `GET /api/calibrations/active`. */
export function calibrationHandlers(db: Db): Pick<RouteHandlers, 'calibrations.list' | 'calibrations.active'> {
  return {
    'calibrations.list': async (_req, res) => {
      res.json({ calibrations: await listCalibrations(db) });
    },
    'calibrations.active': async (_req, res) => {
      const active = await findActiveCalibration(db);
      if (!active) throw new HttpError(404, 'No calibration is active');
      res.json(active);
    },
  };
}

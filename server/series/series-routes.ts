import { z } from 'zod';
import type { CalibrationCache } from '../field/calibration-cache.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { storageReadError } from '../storage/read-error.js';
import type { TelemetryWriter } from '../storage/telemetry-writer.js';
import { querySeries } from './series-query.js';

const SeriesRequest = z.object({
  seconds: z.coerce
    .number({ error: 'must be a number of seconds' })
    .int('must be a whole number of seconds')
    .min(1, 'must be at least 1')
    .max(86_400, 'must be at most 86400 (one day)'),
});

/** `GET /api/series?seconds=N` → `{ series, slow }` for the last N seconds (1…86400). */
export function seriesHandlers(calibrations: CalibrationCache, writer: TelemetryWriter): Pick<RouteHandlers, 'series'> {
  return {
    series: async (req, res) => {
      const { seconds } = parseInput(SeriesRequest, req.query, 'query');
      // Frames still queued for the next flush belong in the answer too.
      await writer.flush();
      const toMs = Date.now();
      try {
        res.json(await querySeries(writer, calibrations, toMs - seconds * 1000, toMs));
      } catch (error) {
        throw storageReadError(error);
      }
    },
  };
}

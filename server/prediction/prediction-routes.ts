import { z } from 'zod';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { HISTORY_MAX_SECONDS, type PredictionHistoryRing } from './prediction-history.js';

const HistoryRequest = z.object({
  seconds: z.coerce
    .number({ error: 'must be a number of seconds' })
    .int('must be a whole number of seconds')
    .min(1, 'must be at least 1')
    .max(HISTORY_MAX_SECONDS, `must be at most ${HISTORY_MAX_SECONDS} (the server keeps one hour of predictions)`),
});

/** `GET /api/prediction/history?seconds=N` → PredictionHistory of the last N seconds (1…3600). */
export function predictionHandlers(history: PredictionHistoryRing): Pick<RouteHandlers, 'prediction.history'> {
  return {
    'prediction.history': (req, res) => {
      const { seconds } = parseInput(HistoryRequest, req.query, 'query');
      res.json(history.since(Date.now() - seconds * 1000));
    },
  };
}

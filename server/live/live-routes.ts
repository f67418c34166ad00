import { DEMO_CHANNEL_BANDS } from '../../shared/live/channels.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { LiveStore } from './live-store.js';

/** `GET /api/live` (LiveState) and `GET /api/channels` (display bands). */
export function liveHandlers(live: LiveStore): Pick<RouteHandlers, 'live' | 'channels'> {
  return {
    live: (_req, res) => {
      res.json(live.snapshot());
    },
    channels: (_req, res) => {
      res.json(DEMO_CHANNEL_BANDS);
    },
  };
}

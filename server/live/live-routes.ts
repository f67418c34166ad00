import type { RouteHandlers } from '../http/route-table.js';
import type { LiveStore } from './live-store.js';

/** `GET /api/live` (LiveState); the display bands are served by server/levels/. */
export function liveHandlers(live: LiveStore): Pick<RouteHandlers, 'live'> {
  return {
    live: (_req, res) => {
      res.json(live.snapshot());
    },
  };
}

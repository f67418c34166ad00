import type { BrokerCounters } from '../../broker/broker.js';
import type { DbKind } from '../db/database.js';
import type { DatabaseHealthReport } from '../db/database-health.js';
import type { FanoutCounters } from '../fanout/live-fanout.js';
import type { IngestCounters } from '../ingest/frame-gate.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { WriterCounters } from '../storage/telemetry-writer.js';

/** Body of `GET /api/health`. */
export interface HealthReport {
  /** `degraded` while a part the server needs is failing (the PostgreSQL server unreachable). */
  status: 'ok' | 'degraded';
  uptimeS: number;
  frames: IngestCounters;
  clients: number;
  broker: BrokerCounters | null;
  db: DbKind;
  /** Connection to the PostgreSQL server; null with the embedded PGlite. */
  database: DatabaseHealthReport | null;
  mqttConnected: boolean;
  fanout: FanoutCounters;
  storage: WriterCounters;
}

/** `GET /api/health` (public): liveness plus the pipeline's counters. */
export function healthHandlers(report: () => HealthReport): Pick<RouteHandlers, 'health'> {
  return {
    health: (_req, res) => {
      res.json(report());
    },
  };
}

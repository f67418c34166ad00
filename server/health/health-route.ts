import type { BrokerCounters } from '../../broker/broker.js';
import type { DbKind } from '../db/database.js';
import type { SupervisionCounters } from '../alarms/supervision-log.js';
import type { DatabaseHealthReport } from '../db/database-health.js';
import type { FanoutCounters } from '../fanout/live-fanout.js';
import type { IngestCounters } from '../ingest/frame-gate.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { WriterCounters } from '../storage/telemetry-writer.js';
import type { EventLoopReport } from './event-loop-watch.js';

/** Frames refused or failing within this window (ms) make the status `degraded`. */
export const FAILING_WINDOW_MS = 10_000;

/** Telemetry counters of `/api/health`: the frame gate's, plus the pipeline's delivery errors. */
export interface FrameHealth extends IngestCounters {
  /** Admitted messages on which the pipeline threw (each logged; ingest goes on). */
  deliveryErrors: number;
}

/** Body of `GET /api/health`. */
export interface HealthReport {
  /**
   * `degraded` while a part the server needs is failing: the PostgreSQL server unreachable, the
   * database not taking telemetry, frames refused or failing; `problems` says what.
   */
  status: 'ok' | 'degraded';
  problems: string[];
  uptimeS: number;
  frames: FrameHealth;
  clients: number;
  broker: BrokerCounters | null;
  db: DbKind;
  /** Connection to the PostgreSQL server; null with the embedded PGlite. */
  database: DatabaseHealthReport | null;
  mqttConnected: boolean;
  fanout: FanoutCounters;
  storage: WriterCounters;
  /** Trips and alarm transitions waiting in the supervision journal for the database. */
  supervision: SupervisionCounters;
  eventLoop: EventLoopReport;
}

/** What the status is judged on; times are server epoch ms. */
export interface HealthInputs {
  nowMs: number;
  frames: FrameHealth;
  lastRejectedAtMs: number | null;
  lastDeliveryErrorAtMs: number | null;
  storage: WriterCounters;
  supervision: SupervisionCounters;
  database: DatabaseHealthReport | null;
}

/** Why the server is not fully well, in words for an operator; empty when it is. */
export function healthProblems(h: HealthInputs): string[] {
  const problems: string[] = [];
  const recent = (at: number | null) => at !== null && h.nowMs - at <= FAILING_WINDOW_MS;
  if (h.database?.state === 'unreachable') {
    problems.push(`the PostgreSQL server is unreachable since ${h.database.since}: ${h.database.lastError}`);
  }
  if (recent(h.lastRejectedAtMs)) {
    problems.push(`telemetry refused at the edge within the last ${FAILING_WINDOW_MS / 1000} s (newest reason: ${h.frames.lastRejectReason})`);
  }
  if (recent(h.lastDeliveryErrorAtMs)) {
    problems.push(`the pipeline failed on admitted telemetry within the last ${FAILING_WINDOW_MS / 1000} s (${h.frames.deliveryErrors} in all)`);
  }
  if (h.storage.outage) {
    problems.push(`the database has not taken telemetry writes since ${h.storage.failingSince} (${h.storage.pendingFrames} frames queued): ${h.storage.lastError}`);
  }
  if (h.supervision.failingSince !== null) {
    problems.push(
      `the database has not taken supervision records since ${h.supervision.failingSince} (${h.supervision.journalPending} trips or alarm-transition batches kept in the journal): ${h.supervision.lastError}`,
    );
  }
  if (h.supervision.journalDropped > 0) {
    problems.push(`${h.supervision.journalDropped} batches of alarm transitions were not recorded: the supervision journal was full`);
  }
  return problems;
}

/** `GET /api/health` (public): liveness plus the pipeline's counters. */
export function healthHandlers(report: () => HealthReport): Pick<RouteHandlers, 'health'> {
  return {
    health: (_req, res) => {
      res.json(report());
    },
  };
}

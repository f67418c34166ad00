import { describe, expect, it } from 'vitest';
import { healthProblems, type HealthInputs } from './health-route.js';

const NOW = Date.UTC(2026, 11, 2, 7, 0, 0);

function inputs(patch: Partial<HealthInputs> = {}): HealthInputs {
  return {
    nowMs: NOW,
    frames: { deliveryErrors: 0, lastRejectReason: null } as HealthInputs['frames'],
    lastRejectedAtMs: null,
    lastDeliveryErrorAtMs: null,
    storage: { outage: false } as HealthInputs['storage'],
    supervision: { journalPending: 0, journalBytes: 0, journalDropped: 0, journalUnreadable: 0, journalSyncErrors: 0, failingSince: null, lastError: null },
    database: null,
    ...patch,
  };
}

describe('health problems', () => {
  it('finds none while everything works', () => {
    expect(healthProblems(inputs())).toEqual([]);
  });

  it('names frames refused at the edge within the last 10 s, and forgets them after', () => {
    const frames = { deliveryErrors: 0, lastRejectReason: 'out-of-range' } as HealthInputs['frames'];
    expect(healthProblems(inputs({ frames, lastRejectedAtMs: NOW - 9_000 }))).toEqual([expect.stringMatching(/refused at the edge.*out-of-range/)]);
    expect(healthProblems(inputs({ frames, lastRejectedAtMs: NOW - 11_000 }))).toEqual([]);
  });

  it('names failures of the pipeline on admitted frames', () => {
    const frames = { deliveryErrors: 3, lastRejectReason: null } as HealthInputs['frames'];
    expect(healthProblems(inputs({ frames, lastDeliveryErrorAtMs: NOW - 1000 }))).toEqual([expect.stringMatching(/pipeline failed.*3 in all/)]);
  });

  it('names a database that does not take telemetry, with the queued frames and the error', () => {
    const storage = { outage: true, failingSince: '2026-12-02T06:59:00.000Z', pendingFrames: 3000, lastError: 'connection refused' } as HealthInputs['storage'];
    expect(healthProblems(inputs({ storage }))).toEqual([expect.stringMatching(/since 2026-12-02T06:59:00.000Z \(3000 frames queued\): connection refused/)]);
  });

  it('names supervision records the database refuses (kept in the journal) and batches a full journal refused', () => {
    const supervision = { journalPending: 2, journalBytes: 900, journalDropped: 1, journalUnreadable: 0, journalSyncErrors: 0, failingSince: '2026-12-02T06:59:30.000Z', lastError: 'ECONNREFUSED' };
    expect(healthProblems(inputs({ supervision }))).toEqual([
      expect.stringMatching(/supervision records since 2026-12-02T06:59:30.000Z \(2 trips or alarm-transition batches kept in the journal\): ECONNREFUSED/),
      expect.stringMatching(/^1 batches of alarm transitions were not recorded/),
    ]);
  });

  it('names an unreachable PostgreSQL server', () => {
    const database = { state: 'unreachable', since: '2026-12-02T06:58:00.000Z', lastError: 'ECONNREFUSED', outages: 1 } as const;
    expect(healthProblems(inputs({ database }))).toEqual([expect.stringMatching(/PostgreSQL server is unreachable since 2026-12-02T06:58:00.000Z: ECONNREFUSED/)]);
  });
});

import { describe, expect, it } from 'vitest';
import type { PredictionStatus } from '../../shared/live/live-state.js';
import { refuseWrites } from '../testing/refuse-writes.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { predictionStatusOver, PredictionStatusLog } from './prediction-status-log.js';
import { predictionStatus } from './prediction-status.js';

const T0 = Date.parse('2031-05-04T10:00:00Z');
const MIN = 0.5;
const STALE_MS = 250;

/** The status Live publishes for |B| = `fieldG` with the newest frame at `frameMs`, at `nowMs`. */
function status(fieldG: number, frameMs: number, nowMs: number): PredictionStatus {
  return predictionStatus({ fieldG, lastFrameAtMs: frameMs, nowMs, staleMs: STALE_MS, minFieldG: MIN });
}

describe('PredictionStatusLog: when the prediction applied, kept for Replay', () => {
  const temp = useTempDatabase();

  it('keeps each change of state with the sentence Live showed, not every |B| or stale age, and reads a window with the status in force at its start', async () => {
    const errors: unknown[] = [];
    const log = new PredictionStatusLog({ db: temp.db, retentionDays: 30, onError: (e) => errors.push(e), now: () => T0 });
    const publish = (fieldG: number, frameMs: number, nowMs: number) => log.record(status(fieldG, frameMs, nowMs), nowMs, frameMs);
    publish(8, T0, T0);
    publish(7.9, T0 + 100, T0 + 100); // applies still: not a change
    publish(0.2, T0 + 1000, T0 + 1000); // the field ramped below the least orienting field
    publish(0.1, T0 + 1100, T0 + 1100); // weaker still: Replay words |B| from the recorded field
    publish(0.1, T0 + 1100, T0 + 1500); // no frame for 400 ms: stale
    publish(0.1, T0 + 1100, T0 + 2500); // still the same stale stretch
    publish(6, T0 + 3000, T0 + 3000); // frames again, field up
    await log.close();
    expect(errors).toEqual([]);

    const all = await predictionStatusOver(temp.db, T0 - 1000, T0 + 10_000);
    expect(all.t).toEqual([T0, T0 + 1000, T0 + 1500, T0 + 3000]);
    expect(all.state).toEqual(['applies', 'weak-field', 'stale', 'applies']);
    expect(all.reason[1]).toBe('|B| = 0.20 G is below 0.50 G, too weak to orient the dipoles: the prediction does not apply.');
    expect(all.reason[2]).toMatch(/^No telemetry for 0\.4 s/);
    expect(all.lastFrameAtMs).toEqual([null, null, T0 + 1100, null]);
    expect(all.minFieldG).toEqual([MIN, MIN, MIN, MIN]);

    // A window inside the weak stretch starts with the change in force then.
    const inside = await predictionStatusOver(temp.db, T0 + 1200, T0 + 2000);
    expect(inside.state).toEqual(['weak-field', 'stale']);
    expect(inside.t).toEqual([T0 + 1000, T0 + 1500]);
  });

  it('keeps changes the database refused and writes them, in order, once it takes writes again', async () => {
    const errors: unknown[] = [];
    const at = T0 + 60_000;
    const log = new PredictionStatusLog({ db: temp.db, retentionDays: 30, onError: (e) => errors.push(e), now: () => at });
    const refusal = await refuseWrites(temp.db, 'prediction_status_changes');
    log.record(status(0.1, at, at), at, at);
    await expect(log.flush()).rejects.toThrow();
    log.record(status(5, at + 500, at + 500), at + 500, at + 500);
    await refusal.allow();
    await log.close();
    expect(errors).toEqual([]);
    const window = await predictionStatusOver(temp.db, at + 1, at + 1000);
    expect(window.t).toEqual([at, at + 500]);
    expect(window.state).toEqual(['weak-field', 'applies']);
  });

  it('drops changes older than the retention when it writes', async () => {
    const later = T0 + 31 * 86_400_000;
    const log = new PredictionStatusLog({ db: temp.db, retentionDays: 30, onError: (e) => expect.fail(String(e)), now: () => later });
    log.record(status(0.1, later, later), later, later);
    await log.close();
    const window = await predictionStatusOver(temp.db, T0, later + 1);
    expect(window.t).toEqual([later]);
  });
});

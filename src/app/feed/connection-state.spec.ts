import { describe, expect, it } from 'vitest';
import { DELAYED_AFTER_MS, STALE_AFTER_MS, isStale, judgeConnection, type ConnectionInputs } from './connection-state';

const NOW = Date.UTC(2025, 2, 14, 21, 0, 0);

function inputs(overrides: Partial<ConnectionInputs>): ConnectionInputs {
  return { nowMs: NOW, linkOpen: true, lastMessageAtMs: NOW - 20, lastFrameAtMs: NOW - 30, controllerOnline: true, ...overrides };
}

describe('judgeConnection', () => {
  it('reports live while messages and frames are fresh', () => {
    const reading = judgeConnection(inputs({}));
    expect(reading.state).toBe('live');
    expect(reading.dataAgeMs).toBe(30);
  });

  it('reports delayed once the newest data is older than the delay threshold', () => {
    expect(judgeConnection(inputs({ lastFrameAtMs: NOW - DELAYED_AFTER_MS })).state).toBe('delayed');
  });

  it('reports stale once the newest frame is older than the stale threshold, although messages keep arriving', () => {
    const reading = judgeConnection(inputs({ lastMessageAtMs: NOW - 10, lastFrameAtMs: NOW - STALE_AFTER_MS - 500 }));
    expect(reading).toMatchObject({ state: 'stale', reason: 'old-data', newestDataAtMs: NOW - STALE_AFTER_MS - 500 });
  });

  it('reports stale when messages stop although the last one carried a fresh frame', () => {
    const reading = judgeConnection(inputs({ lastMessageAtMs: NOW - 5000, lastFrameAtMs: NOW - 5010 }));
    expect(reading.state).toBe('stale');
    expect(reading.dataAgeMs).toBe(5010);
  });

  it('reports stale with its reason when the server says the controller is offline', () => {
    expect(judgeConnection(inputs({ controllerOnline: false }))).toMatchObject({ state: 'stale', reason: 'controller-offline' });
  });

  it('reports stale with no data before the first frame arrives', () => {
    expect(judgeConnection(inputs({ lastFrameAtMs: null }))).toMatchObject({ state: 'stale', reason: 'no-data', dataAgeMs: null });
  });

  it('reports offline when the link is closed, keeping the time of the newest data', () => {
    const reading = judgeConnection(inputs({ linkOpen: false, lastMessageAtMs: NOW - 100, lastFrameAtMs: NOW - 120 }));
    expect(reading).toMatchObject({ state: 'offline', reason: 'no-link', newestDataAtMs: NOW - 120 });
  });

  it('never reports a negative age when the clocks disagree slightly', () => {
    expect(judgeConnection(inputs({ lastMessageAtMs: NOW + 15, lastFrameAtMs: NOW + 40 })).dataAgeMs).toBe(0);
  });
});

describe('isStale', () => {
  it('treats stale and offline as not current, live and delayed as current', () => {
    expect([isStale('live'), isStale('delayed'), isStale('stale'), isStale('offline')]).toEqual([false, false, true, true]);
  });
});

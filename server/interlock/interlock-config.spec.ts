import { describe, expect, it } from 'vitest';
import { DEMO_INTERLOCK_CONFIG, parseInterlockConfig } from './interlock-config.js';
import { DEMO_LEVEL_SET } from '../levels/demo-levels.js';

describe('interlock configuration', () => {
  it('takes its demo trip levels from the demo level set', () => {
    expect(DEMO_INTERLOCK_CONFIG).toMatchObject({
      currentTripA: DEMO_LEVEL_SET.trips.currentHighA,
      temperatureTripC: DEMO_LEVEL_SET.trips.temperatureHighC,
      flowTripLpm: DEMO_LEVEL_SET.trips.flowLowLpm,
      staleMs: 250,
    });
  });

  it('overrides single levels and keeps the other defaults', () => {
    expect(parseInterlockConfig({ staleMs: 500 })).toEqual({ ...DEMO_INTERLOCK_CONFIG, staleMs: 500 });
  });

  it('names each bad field and what it must be', () => {
    expect(() => parseInterlockConfig({ staleMs: -1, maxLostFrames: 2.5 })).toThrow(
      /staleMs: staleMs must be more than 0 ms; maxLostFrames: maxLostFrames must be a whole number of frames/,
    );
    expect(() => parseInterlockConfig({ currentTripAmps: 20 })).toThrow(/currentTripAmps/);
    expect(() => parseInterlockConfig('fast')).toThrow(/must be an object/);
  });
});

import { describe, expect, it } from 'vitest';
import { DEMO_PARAMETERS } from '../shared/apparatus/coil-data.js';
import { TripChain, type TripInputs } from './trip-chain.js';

const normal = (): TripInputs => ({
  currentA: { x: 5, y: 5, z: 5 },
  coilTempC: { x: 30, y: 30, z: 30 },
  flowLpm: { x: 3, y: 3, z: 3 },
});
const levels = DEMO_PARAMETERS.trips;

describe('hardware trip chain', () => {
  it('sits beyond the software trip levels of the live channel bands', () => {
    expect(levels.overTemperatureC).toBeGreaterThan(65);
    expect(levels.lowFlowLpm).toBeLessThan(1);
    expect(levels.overCurrentA).toBeGreaterThan(DEMO_PARAMETERS.supply.currentLimitA);
    expect(DEMO_PARAMETERS.supply.currentLimitA).toBeGreaterThan(20);
  });

  it('stays clear under normal conditions', () => {
    const chain = new TripChain(levels);
    expect(chain.evaluate(normal(), 0.001, 1)).toBeNull();
  });

  it('latches an over-temperature and keeps it latched after the coil cools', () => {
    const chain = new TripChain(levels);
    const hot = normal();
    hot.coilTempC.y = 76;
    expect(chain.evaluate(hot, 0.001, 1)).toEqual({ cause: 'over-temperature', axis: 'y', atMs: 1 });
    expect(chain.evaluate(normal(), 0.001, 2)?.cause).toBe('over-temperature');
  });

  it('refuses the local reset while the cause still holds and accepts it once cleared', () => {
    const chain = new TripChain(levels);
    const hot = normal();
    hot.coilTempC.z = 80;
    chain.evaluate(hot, 0.001, 1);
    const refused = chain.reset(hot);
    expect(refused.reset).toBe(false);
    expect(!refused.reset && refused.reason).toMatch(/over-temperature on axis z/);
    expect(chain.latched).not.toBeNull();
    expect(chain.reset(normal())).toEqual({ reset: true });
    expect(chain.latched).toBeNull();
  });

  it('trips on low flow only after the flow switch delay', () => {
    const chain = new TripChain(levels);
    const dry = normal();
    dry.flowLpm.x = 0.3;
    for (let t = 0; t < 1900; t++) expect(chain.evaluate(dry, 0.001, t)).toBeNull();
    for (let t = 1900; t < 2100; t++) chain.evaluate(dry, 0.001, t);
    expect(chain.latched?.cause).toBe('low-flow');
    expect(chain.latched?.axis).toBe('x');
  });

  it('ignores a flow dip shorter than the delay', () => {
    const chain = new TripChain(levels);
    const dry = normal();
    dry.flowLpm.x = 0.3;
    for (let t = 0; t < 1500; t++) chain.evaluate(dry, 0.001, t);
    chain.evaluate(normal(), 0.001, 1500);
    for (let t = 1501; t < 3000; t++) chain.evaluate(dry, 0.001, t);
    expect(chain.latched).toBeNull();
  });

  it('trips at once on over-current of either sign', () => {
    const chain = new TripChain(levels);
    const high = normal();
    high.currentA.x = -24.5;
    expect(chain.evaluate(high, 0.001, 5)?.cause).toBe('over-current');
  });

  it('keeps the first cause when a second one follows (first-out)', () => {
    const chain = new TripChain(levels);
    const high = normal();
    high.currentA.y = 25;
    chain.evaluate(high, 0.001, 1);
    const hot = normal();
    hot.coilTempC.x = 90;
    expect(chain.evaluate(hot, 0.001, 2)).toEqual({ cause: 'over-current', axis: 'y', atMs: 1 });
  });
});

/**
 * Benchmarks of the physics model for `npm run bench`: a warm-started prediction after a 0.5°
 * field step (what the live panel does), a cold prediction, and full orientation maps at 2°.
 * Targets (issue 3, on the 2-core reference machine): warm ≤ 1 ms median, full 2° map ≤ 5 s.
 * Every result feeds a checksum that must come out finite, so no work can be optimised away.
 */
import { quantile, type Figure } from '../../test/bench/figures.js';
import { EnergyFunctional } from './energy.js';
import { computeOrientationMap } from './orientation-map.js';
import { predict, type SampleParams, type WarmStart } from './predict.js';

const SAMPLE: SampleParams = { species: '167Er', atomNumber: 5e4, trapHz: [350, 80, 400] };
const WARM_TARGET_MS = 1;
const MAP_TARGET_MS = 5000;

function guard(checksum: number, what: string): void {
  if (!Number.isFinite(checksum)) throw new Error(`benchmark ${what} produced a non-finite result`);
}

/** Times `count` calls of `step(i)`, ms each, after `warmup` untimed calls. */
function timeEach(count: number, warmup: number, step: (i: number) => number, what: string): number[] {
  let checksum = 0;
  for (let i = 0; i < warmup; i++) checksum += step(i);
  const times: number[] = [];
  for (let i = 0; i < count; i++) {
    const t0 = performance.now();
    checksum += step(warmup + i);
    times.push(performance.now() - t0);
  }
  guard(checksum, what);
  return times;
}

/** Mean time of one energy evaluation (the innermost call of every solve), µs. */
function energyEvaluationMicros(): number {
  const energy = new EnergyFunctional();
  energy.setProblem([1.2, 0.6, 1 / 0.72], [0.5, 0.3, Math.sqrt(0.66)], 0.01);
  energy.centreOnIdealGas();
  const p = new Float64Array([0.01, -0.02, 0.03, 0.01, 0.02, -0.01, 0.02]);
  const count = 200_000;
  let checksum = 0;
  let t0 = 0;
  for (let i = 0; i < 2 * count; i++) {
    if (i === count) t0 = performance.now();
    p[0] = 0.01 + i * 1e-9;
    checksum += energy.evaluate(p);
  }
  guard(checksum, 'energy evaluation');
  return ((performance.now() - t0) / count) * 1000;
}

/** All physics figures: energy call, warm and cold predictions, 2° orientation maps. */
export async function benchPhysics(): Promise<Figure[]> {
  const energyMicros = energyEvaluationMicros();
  // Warm: the field walks along a great circle (the φ = 25° meridian) in exact 0.5° steps.
  let warm: WarmStart | undefined;
  const warmTimes = timeEach(2000, 200, (i) => {
    const p = predict(SAMPLE, { thetaDeg: 35 + 0.5 * i, phiDeg: 25 }, { tofMs: [20], warm });
    warm = p.warm;
    return p.fermiSurface!.aspectRatio + p.tof![0].aspectRatio;
  }, 'warm solve');
  const coldTimes = timeEach(300, 30, (i) => {
    const p = predict(SAMPLE, { thetaDeg: (i * 7.3) % 180, phiDeg: (i * 13.1) % 360 }, { tofMs: [20] });
    return p.fermiSurface!.aspectRatio;
  }, 'cold solve');
  const mapTime = (quantity: 'fermiSurfaceAspect' | 'collapseRatio') => {
    const t0 = performance.now();
    const map = computeOrientationMap(SAMPLE, { quantity, resolutionDeg: 2 });
    const ms = performance.now() - t0;
    let checksum = 0;
    for (const v of map.values) checksum += v;
    guard(checksum, `${quantity} map`);
    return ms;
  };
  const betaMapMs = mapTime('fermiSurfaceAspect');
  const marginMapMs = mapTime('collapseRatio');
  const warmMedian = quantile(warmTimes, 0.5);

  return [
    { name: 'energy evaluation', value: energyMicros, unit: 'µs', note: 'two 3×3 Jacobi decompositions, three R_D, one f(β)' },
    { name: 'warm prediction after 0.5° step, median', value: warmMedian, unit: 'ms', note: '167Er (350, 80, 400) Hz, incl. stability check and 20 ms TOF' },
    { name: 'warm prediction after 0.5° step, p99', value: quantile(warmTimes, 0.99), unit: 'ms' },
    { name: 'warm median / target (1 ms)', value: warmMedian / WARM_TARGET_MS, unit: '×', note: '≤ 1 meets the target' },
    { name: 'cold prediction, median', value: quantile(coldTimes, 0.5), unit: 'ms' },
    { name: 'cold prediction, p99', value: quantile(coldTimes, 0.99), unit: 'ms' },
    { name: 'orientation map β, 2°', value: betaMapMs, unit: 'ms', note: '91 × 181 grid from 2116 solves in one octant' },
    { name: 'β map / target (5 s)', value: betaMapMs / MAP_TARGET_MS, unit: '×', note: '≤ 1 meets the target' },
    { name: 'orientation map collapse ratio, 2°', value: marginMapMs, unit: 'ms', note: 'ε_dd,crit per direction to 1e-3' },
    { name: 'margin map / target (5 s)', value: marginMapMs / MAP_TARGET_MS, unit: '×' },
  ];
}

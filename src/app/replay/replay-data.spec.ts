import { describe, expect, it } from 'vitest';
import { momentAt, toReplayData } from './replay-data';
import { FIXTURE_FROM, historyFixture } from './testing/history-fixture';

describe('toReplayData and momentAt', () => {
  const data = toReplayData(historyFixture());

  it('keeps every returned sample and the window ends', () => {
    expect(data.fromMs).toBe(FIXTURE_FROM);
    expect(data.toMs).toBe(FIXTURE_FROM + 60_000);
    expect(data.fast.length).toBe(historyFixture().series.t.length);
    expect(data.slow.length).toBe(61);
  });

  it('picks the values of the sample at a moment, and of the newest one before it in between', () => {
    const at = momentAt(data, FIXTURE_FROM + 12_300);
    expect(at.field?.thetaDeg).toBeCloseTo(22.3, 9);
    expect(at.field?.phiDeg).toBe(45);
    expect(at.field?.magnitude).toBe(12.5);
    expect(at.coils.currents).toEqual({ x: 1.123, y: 2, z: 3 });
    const between = momentAt(data, FIXTURE_FROM + 12_399);
    expect(between.field?.thetaDeg).toBeCloseTo(22.3, 9);
    expect(between.coils.temperatureC?.x).toBeCloseTo(21.2, 9); // slow sample at 12 s
  });

  it('rebuilds the field vector from |B|, θ and φ', () => {
    const field = momentAt(data, FIXTURE_FROM).field;
    if (!field) throw new Error('expected a field at the window start');
    const { vector, magnitude } = field;
    expect(Math.hypot(vector.x, vector.y, vector.z)).toBeCloseTo(magnitude, 9);
    expect(vector.z / magnitude).toBeCloseTo(Math.cos((10 * Math.PI) / 180), 9); // θ = 10°
    expect(vector.x).toBeCloseTo(vector.y, 9); // φ = 45°
  });

  it('shows nothing, not an old value, inside a gap in the recording', () => {
    const inGap = momentAt(data, FIXTURE_FROM + 35_000);
    expect(inGap.field).toBeNull();
    expect(inGap.coils.currents).toBeNull();
    expect(momentAt(data, FIXTURE_FROM + 31_000).field).not.toBeNull(); // within the hold after the last sample
  });

  it('holds each recorded prediction until the next, the first one from before the window', () => {
    const first = momentAt(data, FIXTURE_FROM).prediction;
    expect(first).toMatchObject({ stable: true, fermiSurfaceAspect: 1.02, tofAspect: 1.019, thetaDeg: 10, computedAt: new Date(FIXTURE_FROM - 5000).toISOString() });
    expect(first?.camera?.tofUm.major).toBe(270);
    expect(momentAt(data, FIXTURE_FROM + 19_999).prediction?.stable).toBe(true);
    expect(momentAt(data, FIXTURE_FROM + 25_000).prediction).toMatchObject({ stable: false, fermiSurfaceAspect: null, collapseRatio: 1.12, camera: null });
    expect(momentAt(data, FIXTURE_FROM - 6000).prediction).toBeNull();
  });

  it('carries the calibration uncertainty of the sample', () => {
    expect(momentAt(data, FIXTURE_FROM + 5000).fieldUncertainty).toEqual({ magnitudeGauss: 0.004, thetaDeg: 0.2, phiDeg: 0.3 });
    expect(momentAt(data, FIXTURE_FROM + 35_000).fieldUncertainty).toBeNull();
  });

  it('leaves what history does not keep empty', () => {
    const { coils } = momentAt(data, FIXTURE_FROM + 1000);
    expect([coils.setpoints, coils.voltageV, coils.waterSupplyC, coils.waterReturnC]).toEqual([null, null, null, null]);
  });

  it('says where the prediction did not apply, worded at the replay clock as Live worded it, and charts a gap there', () => {
    expect(momentAt(data, FIXTURE_FROM + 10_000).predictionStatus).toMatchObject({ state: 'applies', reason: null });
    expect(momentAt(data, FIXTURE_FROM + 55_000).predictionStatus).toEqual({
      state: 'weak-field', fieldG: 0.3, minFieldG: 0.5, reason: '|B| = 0.30 G is below 0.50 G, too weak to orient the dipoles: the prediction does not apply.',
    });
    const stale = historyFixture();
    stale.prediction.status = { t: [FIXTURE_FROM + 5000], state: ['stale'], fieldG: [12.5], minFieldG: [0.5], reason: ['No telemetry for 0.2 s: …'], lastFrameAtMs: [FIXTURE_FROM + 4800] };
    const staleData = toReplayData(stale);
    expect(momentAt(staleData, FIXTURE_FROM + 4000).predictionStatus).toBeNull(); // not recorded: nothing is claimed
    expect(momentAt(staleData, FIXTURE_FROM + 10_000).predictionStatus?.reason).toMatch(/^No telemetry for 5\.2 s: the field now is unknown/);
    const chart = (d: typeof data, ms: number) => d.predicted.valueAt(d.predicted.indexAtOrBefore(FIXTURE_FROM + ms), 0);
    expect(chart(staleData, 4000)).toBeCloseTo(2, 9);
    expect(chart(staleData, 10_000)).toBeNaN();
  });

  it('gives the level set, calibration, profile and alarm limits in force at the moment', () => {
    const at = (ms: number) => momentAt(data, FIXTURE_FROM + ms);
    expect([at(10_000).levels?.version, at(25_000).levels?.version]).toEqual([1, 2]);
    expect(at(25_000).levels?.bands.bands['current.x'].normal).toEqual([-18, 18]);
    expect([at(39_000).calibration?.version, at(41_000).calibration?.version]).toEqual([1, 2]);
    expect(at(41_000).profile).toMatchObject({ id: 3, version: 2 });
    expect([at(44_000).alarmLimits?.limits[0].limit, at(46_000).alarmLimits?.limits[0].limit]).toEqual([18, 16]);
  });

  it('charts the predicted deformation as a held step in percent', () => {
    expect(data.predicted.length).toBeGreaterThan(100);
    const i = data.predicted.indexAtOrBefore(FIXTURE_FROM + 10_000);
    expect(data.predicted.valueAt(i, 0)).toBeCloseTo(2, 9);
    expect(data.predicted.valueAt(data.predicted.indexAtOrBefore(FIXTURE_FROM + 30_000), 0)).toBeNaN();
  });
});

import { describe, expect, it } from 'vitest';
import type { ShotRow } from '../../../shared/shots/shots-api';
import { shotChartData } from './shot-chart';
import { agreement, shotsCsv, shotView, sortShots } from './shot-comparison';

function row(id: string, theta: number | null, predicted: number | null, measured: number | null, sigma: number | null = null): ShotRow {
  return {
    id, label: `θ = ${theta}°`, at: `2026-11-30T22:0${id.length % 10}:00.000Z`, runId: 4,
    field: { magnitude: 8, thetaDeg: theta, phiDeg: 0 },
    prediction: predicted === null ? null : { fermiSurfaceAspect: 1.03, cloudAspect: 1.2, tofAspect: predicted, tofMajorAngleDeg: 90, collapseRatio: 0.4 },
    measured: measured === null ? null : { tofAspect: measured, tofAngleDeg: 88, sigma },
  };
}

describe('shots measured against predicted', () => {
  it('forms the residual and the ratio of deformations, (measured − 1)/(predicted − 1)', () => {
    const v = shotView(row('a', 30, 1.02, 1.012, 0.003));
    expect(v.residual).toBeCloseTo(-0.008, 12);
    expect(v.deformationRatio).toBeCloseTo(0.6, 12);
    expect(v).toMatchObject({ thetaDeg: 30, magnitudeG: 8, sigma: 0.003, measuredAngleDeg: 88, predictedAngleDeg: 90 });
  });

  it('shows an azimuth just below 360° as the 0° it rounds to', () => {
    expect(shotView({ ...row('a', 30, 1.02, null), field: { magnitude: 8, thetaDeg: 30, phiDeg: 359.97 } }).phiDeg).toBeCloseTo(-0.03, 12);
    expect(shotView({ ...row('a', 30, 1.02, null), field: { magnitude: 8, thetaDeg: 30, phiDeg: 359.9 } }).phiDeg).toBe(359.9);
  });

  it('leaves the ratio out where the predicted image is nearly round or a value is missing', () => {
    expect(shotView(row('a', 0, 1.0005, 1.01)).deformationRatio).toBeNull();
    expect(shotView(row('a', 0, 1.02, null))).toMatchObject({ residual: null, deformationRatio: null });
    expect(shotView(row('a', 0, null, 1.01))).toMatchObject({ residual: null, deformationRatio: null, predictedAspect: null });
  });

  it('gives the mean ratio with its sample standard deviation over the shots that have both', () => {
    // Ratios 0.5, 0.6, 0.7: mean 0.6, sample standard deviation 0.1.
    const views = [row('a', 0, 1.02, 1.01), row('b', 10, 1.02, 1.012), row('c', 20, 1.02, 1.014), row('d', 30, 1.02, null)].map(shotView);
    const a = agreement(views);
    expect(a.count).toBe(3);
    expect(a.meanRatio).toBeCloseTo(0.6, 12);
    expect(a.spread).toBeCloseTo(0.1, 12);
    expect(a.meanResidual).toBeCloseTo(-0.008, 12);
    expect(agreement([views[0]])).toMatchObject({ count: 1, spread: null });
    expect(agreement([])).toEqual({ count: 0, meanRatio: null, spread: null, meanResidual: null });
  });

  it('sorts by a column either way with missing values last', () => {
    const views = [row('a', 30, 1.02, 1.01), row('b', 10, 1.02, null), row('c', 20, 1.02, 1.015)].map(shotView);
    expect(sortShots(views, 'thetaDeg', 'asc').map((v) => v.id)).toEqual(['b', 'c', 'a']);
    expect(sortShots(views, 'measuredAspect', 'desc').map((v) => v.id)).toEqual(['c', 'a', 'b']);
    expect(sortShots(views, 'measuredAspect', 'asc').map((v) => v.id)).toEqual(['a', 'c', 'b']);
    expect(sortShots(views, 'thetaDeg', '').map((v) => v.id)).toEqual(['a', 'b', 'c']);
  });

  it('exports CSV with units in the header, quoted labels and empty cells for missing values', () => {
    const text = shotsCsv([shotView({ ...row('a', 30, 1.02, 1.012, 0.003), label: 'scan, "fast"' }), shotView(row('b', 10, 1.02, null))]);
    const lines = text.split('\r\n');
    expect(lines[0]).toBe(
      'shot,label,time_utc,run,field_G,theta_deg,phi_deg,predicted_tof_aspect_ratio,predicted_tof_angle_deg,measured_tof_aspect_ratio,measured_tof_angle_deg,sigma_aspect_ratio,measured_minus_predicted,deformation_ratio',
    );
    expect(lines[1]).toBe('a,"scan, ""fast""",2026-11-30T22:01:00.000Z,4,8,30,0,1.02,90,1.012,88,0.003,-0.008,0.6');
    expect(lines[2]).toBe('b,θ = 10°,2026-11-30T22:01:00.000Z,4,8,10,0,1.02,90,,,,,');
    expect(lines[3]).toBe('');
  });

  it('charts against θ, leaves out shots without θ, and keeps every error bar inside the range', () => {
    const views = [row('a', 40, 1.02, 1.03, 0.01), row('b', null, 1.02, 1.01), row('c', 10, 1.015, null)].map(shotView);
    const aspect = shotChartData(views, 'aspect');
    expect(aspect.theta).toEqual([10, 40]);
    expect(aspect.predicted).toEqual([1.015, 1.02]);
    expect(aspect.measured).toEqual([null, 1.03]);
    expect(aspect.sigma).toEqual([null, 0.01]);
    expect(aspect.range[0]).toBeLessThan(1.015);
    expect(aspect.range[1]).toBeGreaterThan(1.04);
    const residual = shotChartData(views, 'residual');
    expect(residual.measured[1]).toBeCloseTo(0.01, 12);
    // Symmetric about zero, so the sign of a difference reads at a glance.
    expect(residual.range[0]).toBeCloseTo(-residual.range[1], 12);
    expect(residual.range[1]).toBeGreaterThan(0.02);
  });
});

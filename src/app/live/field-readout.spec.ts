import { describe, expect, it } from 'vitest';
import { readField } from './field-readout';

describe('readField', () => {
  it('shows |B| in gauss and millitesla and both angles with units', () => {
    const readout = readField({ vector: { x: 0, y: 8.5, z: 8.5 }, magnitude: 12.0208, thetaDeg: 45, phiDeg: 90 });
    expect(readout).toEqual({
      magnitudeGauss: '12.021\u00a0G',
      // 1 G = 10⁻⁴ T = 0.1 mT (SI Brochure 8th ed., Table 9)
      magnitudeMilliTesla: '1.2021\u00a0mT',
      theta: '45.0°',
      phi: '90.0°',
      angleNote: null,
    });
  });

  it('shows dashes and says why when the angles are null at zero field', () => {
    const readout = readField({ vector: { x: 0, y: 0, z: 0 }, magnitude: 0, thetaDeg: null, phiDeg: null });
    expect(readout.theta).toBe('—');
    expect(readout.phi).toBe('—');
    expect(readout.magnitudeGauss).toBe('0.000\u00a0G');
    expect(readout.angleNote).toMatch(/undefined while \|B\| ≈ 0/);
  });

  it('shows dashes everywhere before the first field arrives', () => {
    const readout = readField(null);
    expect([readout.magnitudeGauss, readout.magnitudeMilliTesla, readout.theta, readout.phi]).toEqual(['—', '—', '—', '—']);
    expect(readout.angleNote).toBe('No field data yet.');
  });

  it('keeps a polar angle of 180° and an azimuth just below 360° as they are', () => {
    expect(readField({ vector: { x: 0, y: 0, z: -3 }, magnitude: 3, thetaDeg: 180, phiDeg: 0 }).theta).toBe('180.0°');
    expect(readField({ vector: { x: 1, y: -0.001, z: 0 }, magnitude: 1, thetaDeg: 90, phiDeg: 359.94 }).phi).toBe('359.9°');
  });

  it('shows an azimuth that would round to 360.0° as 0.0°', () => {
    expect(readField({ vector: { x: 1, y: -0.0001, z: 0 }, magnitude: 1, thetaDeg: 90, phiDeg: 359.96 }).phi).toBe('0.0°');
    expect(readField({ vector: { x: 1, y: -0.0001, z: 0 }, magnitude: 1, thetaDeg: 90, phiDeg: 359.99 }).phi).toBe('0.0°');
  });
});

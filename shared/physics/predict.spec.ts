import { describe, expect, it } from 'vitest';
import { PhysicsInputError } from './input-error.js';
import { predict, type SampleParams } from './predict.js';

const ER: SampleParams = { species: '167Er', atomNumber: 5e4, trapHz: [350, 80, 400] };

describe('predict', () => {
  it('gives the ideal-gas scales of 167Er, N = 5e4, (350, 80, 400) Hz', () => {
    // physics.md §7(a) [V]: E_F0/kB = 718.818 nK, K_F0 = 22.2425 μm⁻¹, R_TF0 = (3.8479, 16.8346, 3.3669) μm; ε_dd = 0.12186 (§3.2).
    const p = predict(ER, { thetaDeg: 0, phiDeg: 0 });
    expect(p.scales.fermiEnergyNk).toBeCloseTo(718.818, 3);
    expect(p.scales.kF0PerUm).toBeCloseTo(22.2425, 4);
    expect(p.scales.idealRadiiUm[0]).toBeCloseTo(3.8479, 4);
    expect(p.scales.idealRadiiUm[1]).toBeCloseTo(16.8346, 4);
    expect(p.scales.idealRadiiUm[2]).toBeCloseTo(3.3669, 4);
    expect(p.epsDd).toBeCloseTo(0.12186, 5);
  });

  it('gives β − 1 = 2.05 % and a 20 ms TOF aspect ratio of 1.02045 along y for 167Er with B ∥ z', () => {
    // physics.md §7(f) [V]; the measured TOF deformation (Science 345, 1484 (2014)) is a few
    // percent (from memory), the same size.
    const p = predict(ER, { thetaDeg: 0, phiDeg: 0 }, { tofMs: [20], imaging: 'y' });
    expect(p.fermiSurface?.deformationPercent).toBeCloseTo(2.05, 2);
    expect(p.tof?.[0].aspectRatio).toBeCloseTo(1.02045, 5);
    expect(p.tof?.[0].majorAngleDeg).toBe(-90); // elongated along v = z, the field
  });

  it('reproduces the ideal gas with the weakly dipolar 40K control to 4e-5', () => {
    // physics.md §7(a) [V]: 40K (ε_dd ≈ 2e-4) reproduces the ideal-gas values to 4e-5.
    const p = predict({ ...ER, species: '40K' }, { thetaDeg: 35, phiDeg: 25 });
    expect(Math.abs((p.energyPerParticleEF?.total ?? NaN) - 0.75)).toBeLessThan(4e-5);
    const ideal = [...p.scales.idealRadiiUm].sort((a, b) => b - a);
    p.cloud?.radiiUm.forEach((r, i) => expect(Math.abs(r / ideal[i] - 1)).toBeLessThan(4e-5));
  });

  it('describes the cloud with descending radii, sign-fixed unit axes and angles to the field', () => {
    const p = predict(ER, { thetaDeg: 35, phiDeg: 25 }, { tofMs: [0, 20] });
    const cloud = p.cloud!;
    expect(cloud.radiiUm[0]).toBeGreaterThan(cloud.radiiUm[1]);
    expect(cloud.radiiUm[1]).toBeGreaterThan(cloud.radiiUm[2]);
    for (const axis of cloud.axes) {
      expect(Math.hypot(...axis)).toBeCloseTo(1, 14);
      const largest = axis.reduce((a, b) => (Math.abs(b) > Math.abs(a) ? b : a));
      expect(largest).toBeGreaterThan(0);
    }
    for (const angle of cloud.axisAnglesToFieldDeg) {
      expect(angle).toBeGreaterThanOrEqual(0);
      expect(angle).toBeLessThanOrEqual(90);
    }
    expect(p.fermiSurface!.kParallelPerUm / p.fermiSurface!.kPerpPerUm).toBeCloseTo(p.fermiSurface!.aspectRatio, 12);
    expect(p.tof?.map((t) => t.tMs)).toEqual([0, 20]);
  });

  it('treats a field vector like its angles, and e like −e', () => {
    const t = (35 * Math.PI) / 180;
    const f = (25 * Math.PI) / 180;
    const v = { x: Math.sin(t) * Math.cos(f), y: Math.sin(t) * Math.sin(f), z: Math.cos(t) };
    const byAngles = predict(ER, { thetaDeg: 35, phiDeg: 25 });
    const byVector = predict(ER, { x: 3 * v.x, y: 3 * v.y, z: 3 * v.z });
    const reversed = predict(ER, { x: -v.x, y: -v.y, z: -v.z });
    for (const other of [byVector, reversed]) {
      expect(other.fermiSurface!.aspectRatio).toBeCloseTo(byAngles.fermiSurface!.aspectRatio, 10);
      other.cloud!.radiiUm.forEach((r, i) => expect(r).toBeCloseTo(byAngles.cloud!.radiiUm[i], 6));
    }
  });

  it('gives N_crit = N (ε_c/ε_dd)⁶ and keeps ε_c in the warm state for the same direction', () => {
    // physics.md §4.2: the critical atom number follows from ε_dd ∝ N^(1/6) without a new solve.
    const first = predict(ER, { thetaDeg: 35, phiDeg: 25 }, { computeCritical: true });
    expect(first.atomNumberCritical).toBeCloseTo(ER.atomNumber * (first.epsDdCritical! / first.epsDd) ** 6, -3);
    expect(first.collapseRatio).toBeCloseTo(first.epsDd / first.epsDdCritical!, 14);
    const again = predict(ER, { thetaDeg: 35, phiDeg: 25 }, { computeCritical: true, warm: first.warm });
    expect(again.epsDdCritical).toBe(first.epsDdCritical);
    expect(again.warm?.critical).toBe(first.warm?.critical);
  });

  it('finds the same ε_c after a field step when starting next to the previous threshold', () => {
    const first = predict(ER, { thetaDeg: 35, phiDeg: 25 }, { computeCritical: true });
    const stepped = predict(ER, { thetaDeg: 37, phiDeg: 25 }, { computeCritical: true, warm: first.warm });
    const cold = predict(ER, { thetaDeg: 37, phiDeg: 25 }, { computeCritical: true });
    // Both searches stop at a bracket of relative width 1e-6.
    expect(Math.abs(stepped.epsDdCritical! / cold.epsDdCritical! - 1)).toBeLessThan(1e-6);
  });

  it('follows a field step from the warm state to the cold-start answer', () => {
    const first = predict(ER, { thetaDeg: 35, phiDeg: 25 });
    const warm = predict(ER, { thetaDeg: 35.5, phiDeg: 25 }, { warm: first.warm });
    const cold = predict(ER, { thetaDeg: 35.5, phiDeg: 25 });
    expect(warm.fermiSurface!.aspectRatio).toBeCloseTo(cold.fermiSurface!.aspectRatio, 9);
    warm.cloud!.radiiUm.forEach((r, i) => expect(r).toBeCloseTo(cold.cloud!.radiiUm[i], 6));
  });

  it('reports a collapsed gas with its margin and no geometry', () => {
    // Fully polarised 23Na40K: ε_dd ≈ 50, far above any threshold of this trap (≈ 2.5).
    const p = predict({ ...ER, species: '23Na40K' }, { thetaDeg: 35, phiDeg: 25 }, { tofMs: [20] });
    expect(p.stable).toBe(false);
    expect(p.fermiSurface).toBeNull();
    expect(p.cloud).toBeNull();
    expect(p.energyPerParticleEF).toBeNull();
    expect(p.tof).toBeNull();
    expect(p.collapseRatio).toBeGreaterThan(1);
    expect(p.reason).toMatch(/collapsed/);
    expect(p.reason).toContain(`ε_dd/ε_dd,crit = ${p.collapseRatio!.toFixed(4)}`);
  });

  it('rejects non-physical input with an error naming it', () => {
    const field = { thetaDeg: 0, phiDeg: 0 };
    const cases: [() => unknown, RegExp][] = [
      [() => predict({ ...ER, atomNumber: 0 }, field), /atomNumber/],
      [() => predict({ ...ER, atomNumber: -5 }, field), /atomNumber/],
      [() => predict({ ...ER, atomNumber: NaN }, field), /atomNumber/],
      [() => predict({ ...ER, trapHz: [350, 0, 400] }, field), /trapHz\[1\].*along y/],
      [() => predict({ ...ER, trapHz: [-1, 80, 400] }, field), /trapHz\[0\]/],
      [() => predict({ ...ER, trapHz: [350, 80, Infinity] }, field), /trapHz\[2\]/],
      [() => predict({ ...ER, species: 'unobtainium' }, field), /unknown species "unobtainium"/],
      [() => predict({ ...ER, species: '23Na40K', polarization: 1.5 }, field), /polarization/],
      [() => predict(ER, { x: 0, y: 0, z: 0 }), /field vector is zero/],
      [() => predict(ER, { thetaDeg: NaN, phiDeg: 0 }), /thetaDeg/],
      [() => predict(ER, field, { tofMs: [-1] }), /tofMs\[0\]/],
      [() => predict(ER, field, { imaging: { u: [1, 0, 0], v: [1, 0, 0] } }), /perpendicular/],
    ];
    for (const [call, message] of cases) {
      expect(call).toThrow(PhysicsInputError);
      expect(call).toThrow(message);
    }
  });
});

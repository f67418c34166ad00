import { describe, expect, it } from 'vitest';
import { GroundStateSolver, type GroundState } from './ground-state.js';

const DEG = Math.PI / 180;
const dir = (thetaDeg: number, phiDeg: number) => [
  Math.sin(thetaDeg * DEG) * Math.cos(phiDeg * DEG),
  Math.sin(thetaDeg * DEG) * Math.sin(phiDeg * DEG),
  Math.cos(thetaDeg * DEG),
];
/** λ_a = ω_a/ω̄ of a trap given in Hz. */
const anisotropies = (hz: number[]) => {
  const mean = Math.cbrt(hz[0] * hz[1] * hz[2]);
  return hz.map((f) => f / mean);
};
const ER_TRAP = anisotropies([350, 80, 400]);
const SPHERE = [1, 1, 1];

const solver = new GroundStateSolver();

/**
 * Solves and checks the virial identity 2E_kin − 2E_trap + 3(E_dir + E_ex) = 0, which holds at
 * every stationary point (docs/physics.md §5.3; residual < 1e-8 [I]) — so every solved case in this
 * file also tests it.
 */
function solveStable(lambda: number[], e: number[], epsDd: number, start: GroundState['state'] = null): GroundState {
  const gs = solver.solve(lambda, e, epsDd, start);
  expect(gs.stable, gs.reason).toBe(true);
  const { kinetic, trap, direct, exchange } = gs.energy;
  expect(Math.abs(2 * kinetic - 2 * trap + 3 * (direct + exchange))).toBeLessThan(1e-8);
  return gs;
}

describe('GroundStateSolver', () => {
  it('reproduces the ideal gas without interactions: r_a = 1/λ_a, β = 1, E/N = ¾E_F0', () => {
    // Ideal-gas limit, docs/physics.md §3.2 and §7(a) [I]: R_a = R̄0/λ_a, K = K_F0, E/N = ¾E_F.
    const gs = solveStable(ER_TRAP, dir(35, 25), 0);
    for (let a = 0; a < 3; a++) {
      expect(gs.mr[4 * a] * ER_TRAP[a] ** 2).toBeCloseTo(1, 8);
      for (let b = 0; b < 3; b++) if (a !== b) expect(Math.abs(gs.mr[3 * a + b])).toBeLessThan(1e-9);
    }
    expect(gs.beta).toBeCloseTo(1, 9);
    expect(gs.rbar).toBeCloseTo(1, 9);
    expect(gs.energy.total).toBeCloseTo(0.75, 12);
    expect(gs.energy.kinetic).toBeCloseTo(0.375, 9);
  });

  it('has the weak-coupling slope β − 1 = 0.167442 ε_dd in any trap and direction', () => {
    // docs/physics.md §3.2 [I]: β − 1 = (12/5)ε̃ = 0.167442 ε_dd at first order, trap-independent.
    // At ε_dd = 0.01 the second-order term is ≈ 0.08 % of the first (from the spherical table).
    const cases: [number[], number[]][] = [
      [SPHERE, dir(0, 0)],
      [ER_TRAP, dir(35, 25)],
      [anisotropies([40, 200, 900]), dir(70, 130)],
    ];
    for (const [lambda, e] of cases) {
      const gs = solveStable(lambda, e, 0.01);
      expect(Math.abs((gs.beta - 1) / 0.01 / 0.167442 - 1)).toBeLessThan(2e-3);
    }
  });

  it('reproduces the spherical-trap table of β, R∥/R⊥ and E/(N E_F0)', () => {
    // Independent implementation (docs/physics.md [I]), §7(e), spherical trap, e ∥ z.
    const table: [number, number, number, number][] = [
      [0.1, 1.016872, 1.016725, 0.749906843],
      [0.5, 1.08707, 1.084593, 0.747677833],
      [1.0, 1.181784, 1.178545, 0.740535069],
      [1.5, 1.287225, 1.300853, 0.727613405],
      [2.0, 1.417756, 1.529159, 0.705558266],
      [2.16, 1.492436, 1.786292, 0.694047667],
    ];
    for (const [epsDd, beta, aspect, energy] of table) {
      const gs = solveStable(SPHERE, [0, 0, 1], epsDd);
      expect(Math.abs(gs.beta - beta)).toBeLessThan(1e-6);
      expect(Math.abs(Math.sqrt(gs.mr[8] / gs.mr[0]) - aspect)).toBeLessThan(1e-6);
      expect(Math.abs(gs.energy.total - energy)).toBeLessThan(1e-9);
    }
  });

  it('keeps the cloud aligned with the trap axes when the field is along one', () => {
    // docs/physics.md §3.3: e along a trap axis → no rotation, 4 parameters.
    for (const e of [[1, 0, 0], [0, 1, 0], [0, 0, 1]]) {
      const gs = solveStable(ER_TRAP, e, 0.3);
      for (const k of [1, 2, 5]) expect(Math.abs(gs.mr[k])).toBeLessThan(1e-8);
    }
  });

  it('keeps the third trap axis principal when the field lies in a trap symmetry plane', () => {
    // docs/physics.md §3.3 [I]: e in the xz plane → |M_xy|, |M_yz| < 1e-8, while M_xz is tilted.
    const gs = solveStable(ER_TRAP, dir(35, 0), 0.3);
    expect(Math.abs(gs.mr[1])).toBeLessThan(1e-8);
    expect(Math.abs(gs.mr[5])).toBeLessThan(1e-8);
    expect(Math.abs(gs.mr[2])).toBeGreaterThan(1e-4);
  });

  it('still deforms the Fermi surface with the field at the magic angle', () => {
    // docs/physics.md §7(d): at θ_m the trap-frame deformation does not vanish; the Fermi surface
    // follows e with β ≈ 1.02 for 167Er (ε_dd ≈ 0.12) in a cylindrical trap.
    const gs = solveStable(anisotropies([200, 200, 250]), dir(Math.acos(1 / Math.sqrt(3)) / DEG, 0), 0.12);
    expect(gs.beta).toBeGreaterThan(1.015);
    expect(gs.beta).toBeLessThan(1.025);
  });

  it('lands on the same minimum from a warm start after a small field step as from a cold start', () => {
    // docs/physics.md §4.2 [I]: restarts agree to 7e-8 relative in M_R and 2e-8 in β.
    const before = solveStable(ER_TRAP, dir(35, 25), 0.5);
    const warm = solveStable(ER_TRAP, dir(35.5, 25), 0.5, before.state);
    const cold = solveStable(ER_TRAP, dir(35.5, 25), 0.5);
    for (let k = 0; k < 9; k++) expect(Math.abs(warm.mr[k] - cold.mr[k])).toBeLessThan(1e-7 * Math.abs(cold.mr[0]));
    expect(Math.abs(warm.beta - cold.beta)).toBeLessThan(2e-8);
    expect(warm.evaluations).toBeLessThan(cold.evaluations);
  });

  it('declares collapse beyond the spherical threshold and says why', () => {
    // Spherical-trap ε_dd,c = 2.1659 (docs/physics.md §7(e) [I]).
    const gs = solver.solve(SPHERE, [0, 0, 1], 2.2, null);
    expect(gs.stable).toBe(false);
    expect(gs.state).toBeNull();
    expect(gs.reason).toMatch(/shrinks without bound|edge of the parameter box|not a minimum/);
  });
});

import { describe, expect, it } from 'vitest';
import { normaliseZyzEuler, wrap180 } from './euler-angles.js';
import { trapToCoilMatrix } from './trap-orientation.js';

describe('normaliseZyzEuler', () => {
  it('wraps angles into (−180°, 180°]', () => {
    expect([wrap180(180), wrap180(-180), wrap180(540), wrap180(-0), wrap180(359), wrap180(100_000)]).toEqual([180, 180, 180, 0, -1, -80]);
  });

  it.each([
    [400, 30, -30],
    [10, -45, 20],
    [-720, 200, 725],
    [0, -180, 0],
  ])('keeps the rotation of (%s°, %s°, %s°) and gives β in [0°, 180°]', (a, b, g) => {
    const n = normaliseZyzEuler([a, b, g]);
    expect(n[1]).toBeGreaterThanOrEqual(0);
    expect(n[1]).toBeLessThanOrEqual(180);
    for (const x of [n[0], n[2]]) expect(x > -180 && x <= 180).toBe(true);
    // Same rotation matrix, element by element (the rotation, not the triple, is the physics).
    const before = trapToCoilMatrix([a, b, g]);
    const after = trapToCoilMatrix(n);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(after[i][j]).toBeCloseTo(before[i][j], 12);
  });
});

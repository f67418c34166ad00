import { describe, expect, it } from 'vitest';
import { parseCase } from './case-input.js';
import { PhysicsInputError } from './input-error.js';

const BASE = { species: '167Er', atomNumber: 50000, trapHz: [350, 80, 400], thetaDeg: 35, phiDeg: 25 };

describe('parseCase', () => {
  it('turns the documented case format into sample, field and options', () => {
    const c = parseCase({ ...BASE, tofMs: [0, 20], imaging: { u: [1, 0, 0], v: [0, 0, 1] }, computeCritical: true });
    expect(c.params).toEqual({ species: '167Er', atomNumber: 50000, trapHz: [350, 80, 400], polarization: undefined });
    expect(c.field).toEqual({ thetaDeg: 35, phiDeg: 25 });
    expect(c.options).toEqual({ tofMs: [0, 20], imaging: { u: [1, 0, 0], v: [0, 0, 1] }, computeCritical: true });
  });

  it('accepts custom species and a field vector instead of angles', () => {
    const c = parseCase({ ...BASE, thetaDeg: undefined, phiDeg: undefined, field: { x: 0, y: 0, z: 1 }, species: { massU: 100, dipoleDebye: 1 }, polarization: 0.3 });
    expect(c.field).toEqual({ x: 0, y: 0, z: 1 });
    expect(c.params.species).toEqual({ massU: 100, dipoleDebye: 1 });
    expect(c.params.polarization).toBe(0.3);
  });

  it('names every key of the wrong type and every unknown key, prefixed by the source', () => {
    const call = () => parseCase({ ...BASE, atomNumber: '5e4', trapHz: [1, 2], imaging: 'w', extra: 1 }, 'case.json');
    expect(call).toThrow(PhysicsInputError);
    expect(call).toThrow(/^case\.json: /);
    expect(call).toThrow(/atomNumber must be a finite number/);
    expect(call).toThrow(/trapHz .* must be three numbers/);
    expect(call).toThrow(/imaging must be "x", "y", "z"/);
    expect(call).toThrow(/unknown key\(s\) extra/);
  });

  it('asks for exactly one form of the field direction', () => {
    expect(() => parseCase({ ...BASE, field: { x: 1, y: 0, z: 0 } })).toThrow(/either as thetaDeg and phiDeg or as field/);
    expect(() => parseCase({ ...BASE, thetaDeg: undefined, phiDeg: undefined })).toThrow(/either as thetaDeg and phiDeg or as field/);
    expect(() => parseCase({ ...BASE, phiDeg: undefined })).toThrow(/thetaDeg and phiDeg must be given together/);
  });

  it('rejects a document that is not an object', () => {
    expect(() => parseCase([1, 2, 3])).toThrow(PhysicsInputError);
    expect(() => parseCase(null)).toThrow(PhysicsInputError);
  });
});

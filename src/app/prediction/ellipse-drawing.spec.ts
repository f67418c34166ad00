import { describe, expect, it } from 'vitest';
import { cameraToScreen, drawEllipse, exaggerateAspect, factorFor, TRUE_SHAPE_ABOVE } from './ellipse-drawing';

describe('exaggerateAspect', () => {
  it('multiplies the deformation (aspect − 1) by the factor, not the aspect itself', () => {
    expect(exaggerateAspect(1.02, 10)).toBeCloseTo(1.2, 12);
    expect(exaggerateAspect(1.02, 1)).toBeCloseTo(1.02, 12);
    expect(exaggerateAspect(1, 20)).toBe(1);
  });
});

describe('factorFor', () => {
  it('uses the chosen factor for a small deformation and the true shape for a large one', () => {
    expect(factorFor(1.02, 10)).toBe(10);
    expect(factorFor(1 + TRUE_SHAPE_ABOVE / 2, 10)).toBe(10);
    expect(factorFor(1 + 2 * TRUE_SHAPE_ABOVE, 10)).toBe(1);
  });
});

describe('drawEllipse', () => {
  it('draws the major axis at the given radius and the minor one shortened by the exaggerated aspect', () => {
    const drawn = drawEllipse({ major: 10.2, minor: 10, majorAngleDeg: 0 }, 10, 50);
    expect(drawn.factor).toBe(10);
    expect(drawn.rx).toBe(50);
    expect(drawn.drawnAspect).toBeCloseTo(1.2, 12);
    expect(drawn.ry).toBeCloseTo(50 / 1.2, 12);
  });

  it('turns the major axis from u towards v, which on screen (y down) is a negative SVG rotation', () => {
    expect(drawEllipse({ major: 2, minor: 1.9, majorAngleDeg: 30 }, 10, 50).rotateDeg).toBe(-30);
    expect(drawEllipse({ major: 2, minor: 1.9, majorAngleDeg: -90 }, 10, 50).rotateDeg).toBe(90);
  });

  it('draws a large, trap-made deformation to its true shape and says so with factor 1', () => {
    const drawn = drawEllipse({ major: 16.8, minor: 3.4, majorAngleDeg: 90 }, 10, 50);
    expect(drawn.factor).toBe(1);
    expect(drawn.drawnAspect).toBeCloseTo(16.8 / 3.4, 12);
  });

  it('draws a round image (no angle) as a circle', () => {
    const drawn = drawEllipse({ major: 5, minor: 5, majorAngleDeg: null }, 10, 50);
    expect(drawn.ry).toBe(drawn.rx);
    expect(drawn.rotateDeg).toBe(0);
  });
});

describe('cameraToScreen', () => {
  it('puts u to the right and v upwards (negative SVG y)', () => {
    expect(cameraToScreen(1, 0, 10)).toEqual({ x: 10, y: 0 });
    expect(cameraToScreen(0, 1, 10)).toEqual({ x: 0, y: -10 });
  });
});

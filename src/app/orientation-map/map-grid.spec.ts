import { describe, expect, it } from 'vitest';
import { scaleFor } from './color-scale';
import { cellAtPixel, moveCell, nearestCell, paintMap, type MapGrid } from './map-grid';

/** A 90° grid: θ 0, 90, 180 and φ 0, 90, 180, 270, 360; value = 10·row + col (the 360° column repeats 0°). */
function grid(): MapGrid {
  const thetaDeg = [0, 90, 180];
  const phiDeg = [0, 90, 180, 270, 360];
  const values = new Float64Array(15);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 5; c++) values[r * 5 + c] = 10 * r + (c % 4);
  return { thetaDeg, phiDeg, values };
}

describe('map lookup', () => {
  it('reads θ from top to bottom and φ from left to right of the image', () => {
    // Image 360 × 180 px: one pixel per degree.
    expect(cellAtPixel(grid(), 0, 0, 360, 180)).toMatchObject({ thetaDeg: 0, phiDeg: 0, value: 0 });
    expect(cellAtPixel(grid(), 90, 90, 360, 180)).toMatchObject({ thetaDeg: 90, phiDeg: 90, value: 11 });
    expect(cellAtPixel(grid(), 200, 179, 360, 180)).toMatchObject({ thetaDeg: 180, phiDeg: 180, value: 22 });
  });

  it('reports the right edge as azimuth 0°, the same direction as 360°', () => {
    expect(cellAtPixel(grid(), 359, 90, 360, 180)).toMatchObject({ phiDeg: 0, col: 0 });
    expect(nearestCell(grid(), 90, -80)).toMatchObject({ phiDeg: 270 });
  });

  it('scales with the drawn size of the image', () => {
    expect(cellAtPixel(grid(), 45, 20, 72, 36)).toMatchObject({ thetaDeg: 90, phiDeg: 270 });
  });

  it('moves the keyboard cursor round in φ and stops it at the poles in θ', () => {
    const g = grid();
    const start = nearestCell(g, 90, 0);
    expect(moveCell(g, start, 0, -1)).toMatchObject({ phiDeg: 270, thetaDeg: 90 });
    expect(moveCell(g, start, -5, 0)).toMatchObject({ thetaDeg: 0 });
    expect(moveCell(g, start, 5, 4)).toMatchObject({ thetaDeg: 180, phiDeg: 0 });
  });
});

describe('paintMap', () => {
  it('hatches collapsed nodes in grey and colours the others', () => {
    const g = grid();
    (g.values as Float64Array)[0] = Number.NaN; // θ = 0
    const width = 8;
    const height = 8;
    const image = { data: new Uint8ClampedArray(4 * width * height), width, height };
    paintMap(g, 'fermiSurfaceAspect', scaleFor(g.values, 'fermiSurfaceAspect'), image);
    const pixel = (x: number, y: number) => Array.from(image.data.slice(4 * (y * width + x), 4 * (y * width + x) + 4));
    // Top row (θ near 0°) is hatch grey; the equator row is palette-coloured.
    const top = pixel(0, 0);
    expect(top[0]).toBe(top[1]);
    expect(top[1]).toBe(top[2]);
    const middle = pixel(3, 4);
    expect(middle[3]).toBe(255);
    expect(new Set(middle.slice(0, 3)).size).toBeGreaterThan(1);
  });
});

import type { MapQuantity } from '../../../shared/physics/orientation-map';
import { colorOf, type ColorScale } from './color-scale';

/** The grid of an orientation map (shared/physics computeOrientationMap). */
export interface MapGrid {
  /** Polar angles of the rows, 0…180° in equal steps. */
  thetaDeg: readonly number[];
  /** Azimuths of the columns, 0…360° in equal steps (the last column repeats the first). */
  phiDeg: readonly number[];
  /** Row-major [θ][φ]. */
  values: ArrayLike<number>;
}

/** One grid node: where it is and its value. */
export interface MapCell {
  row: number;
  col: number;
  thetaDeg: number;
  phiDeg: number;
  value: number;
}

/**
 * The grid node nearest to a field direction. θ is clamped to 0…180°; φ wraps, and 360° is
 * reported as 0°, the same direction.
 */
export function nearestCell(grid: MapGrid, thetaDeg: number, phiDeg: number): MapCell {
  const rows = grid.thetaDeg.length;
  const cols = grid.phiDeg.length - 1; // distinct azimuths
  const thetaStep = 180 / (rows - 1);
  const phiStep = 360 / cols;
  const row = Math.min(rows - 1, Math.max(0, Math.round(thetaDeg / thetaStep)));
  const wrapped = ((phiDeg % 360) + 360) % 360;
  const col = Math.round(wrapped / phiStep) % cols;
  return cellOf(grid, row, col);
}

/**
 * The node under a point of the drawn map: the image is equirectangular, θ 0…180° from top to
 * bottom and φ 0…360° from left to right; `x` and `y` are pixel positions inside an image of
 * `width` × `height` pixels (the pixel's centre is used).
 */
export function cellAtPixel(grid: MapGrid, x: number, y: number, width: number, height: number): MapCell {
  const thetaDeg = (180 * (Math.min(height - 1, Math.max(0, y)) + 0.5)) / height;
  const phiDeg = (360 * (Math.min(width - 1, Math.max(0, x)) + 0.5)) / width;
  return nearestCell(grid, thetaDeg, phiDeg);
}

/** The node `rows` and `cols` steps away: θ stops at the poles, φ goes round. */
export function moveCell(grid: MapGrid, from: MapCell, rows: number, cols: number): MapCell {
  const distinct = grid.phiDeg.length - 1;
  const row = Math.min(grid.thetaDeg.length - 1, Math.max(0, from.row + rows));
  const col = (((from.col + cols) % distinct) + distinct) % distinct;
  return cellOf(grid, row, col);
}

function cellOf(grid: MapGrid, row: number, col: number): MapCell {
  return { row, col, thetaDeg: grid.thetaDeg[row], phiDeg: grid.phiDeg[col], value: grid.values[row * grid.phiDeg.length + col] };
}

/** Hatch of collapsed regions: two greys in diagonal stripes 3 px wide every 8 px. */
const HATCH_INK: readonly number[] = [96, 96, 96];
const HATCH_PAPER: readonly number[] = [216, 216, 216];

/**
 * Paints the map into RGBA pixels (`ImageData`-like, `width` × `height`): each pixel takes the
 * colour of its nearest grid node, collapsed nodes are hatched.
 */
export function paintMap(grid: MapGrid, quantity: MapQuantity, scale: ColorScale, image: { data: Uint8ClampedArray; width: number; height: number }): void {
  const { data, width, height } = image;
  // Colour each node once (at most 181 × 361 of them), then only copy per pixel.
  const nodes = grid.values.length;
  const nodeColor = new Uint8ClampedArray(3 * nodes);
  const hatched = new Uint8Array(nodes);
  for (let k = 0; k < nodes; k++) {
    const color = colorOf(grid.values[k], quantity, scale);
    if (color) nodeColor.set(color, 3 * k);
    else hatched[k] = 1;
  }
  const colOfX = new Int32Array(width);
  for (let x = 0; x < width; x++) colOfX[x] = cellAtPixel(grid, x, 0, width, height).col;
  const stride = grid.phiDeg.length;
  for (let y = 0; y < height; y++) {
    const rowStart = cellAtPixel(grid, 0, y, width, height).row * stride;
    for (let x = 0; x < width; x++) {
      const k = rowStart + colOfX[x];
      const at = 4 * (y * width + x);
      if (hatched[k]) {
        const ink = (x + y) % 8 < 3 ? HATCH_INK : HATCH_PAPER;
        data[at] = ink[0];
        data[at + 1] = ink[1];
        data[at + 2] = ink[2];
      } else {
        data[at] = nodeColor[3 * k];
        data[at + 1] = nodeColor[3 * k + 1];
        data[at + 2] = nodeColor[3 * k + 2];
      }
      data[at + 3] = 255;
    }
  }
}

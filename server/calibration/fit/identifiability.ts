import { CURRENT_COLUMNS, type Triple } from './calibration-csv.js';
import { type Matrix, nullDirection } from './dense.js';
import { CalibrationInputError } from './fit-input-error.js';

const PAIRS = ['x', 'y', 'z'] as const;

/**
 * Refuses a set of currents that cannot determine every parameter, saying why in the lab's
 * terms: a pair that never moves, only one pair moving, two pairs that only ever move in a
 * fixed proportion, or pairs never run together (then the angle between their fields is open).
 * `design` holds one row per point over the terms named by `terms`.
 */
export function requireDetermined(currents: readonly Triple[], design: Matrix, terms: readonly string[]): void {
  const still = PAIRS.filter((_, axis) => {
    const values = currents.map((c) => c[axis]);
    const span = Math.max(...values) - Math.min(...values);
    return !(span > 1e-9 * Math.max(1, ...values.map(Math.abs)));
  });
  if (still.length === 3) {
    throw new CalibrationInputError('no pair ever moves (every current column is the same on every line): the coil fields cannot be determined');
  }
  if (still.length === 2) {
    const moving = PAIRS.find((p) => !still.includes(p))!;
    throw new CalibrationInputError(
      `only the ${moving} pair ever moves (${still.map(column).join(' and ')} never change): the fields of the ${still.join(' and ')} pairs cannot be determined; add points where every pair runs`,
    );
  }
  if (still.length === 1) {
    throw new CalibrationInputError(
      `column ${column(still[0])}: the ${still[0]} pair never moves (the same current on every line), so its field cannot be determined; add points where it runs`,
    );
  }
  const open = nullDirection(design);
  if (!open) return;
  const involved = terms.filter((_, i) => Math.abs(open[i]) > 0.3);
  const cross = involved.find((t) => /^I[xyz]·I[xyz]$/.test(t));
  if (cross) {
    const [a, b] = [cross[1], cross[4]];
    throw new CalibrationInputError(
      `the currents do not determine every parameter: the ${a} and ${b} pairs never run together at independent currents, so the angle between their fields is open (term ${cross}); add points with both running`,
    );
  }
  const linear = involved.filter((t) => /^I[xyz]$/.test(t));
  if (linear.length >= 2) {
    throw new CalibrationInputError(
      `the currents do not determine every parameter: ${linear.map((t) => column(t[1] as (typeof PAIRS)[number])).join(' and ')} only ever move in a fixed proportion; add points where they move independently`,
    );
  }
  throw new CalibrationInputError(
    `the currents do not determine every parameter (terms ${involved.join(', ')} are not fixed by these points); add points that spread every current over its range and run the pairs together`,
  );
}

function column(pair: (typeof PAIRS)[number]): string {
  return CURRENT_COLUMNS[PAIRS.indexOf(pair)];
}

/**
 * Canonical z-y-z Euler angles. Every rotation has many angle triples; the stored one has α
 * and γ in (−180°, 180°] and β in [0°, 180°], so that 400° and 40° are stored alike and a
 * reader sees familiar numbers. The rotation Rz(α)·Ry(β)·Rz(γ) is unchanged: a negative β is
 * the same rotation as (α + 180°, −β, γ + 180°) (docs/field-math.md).
 */
export function normaliseZyzEuler([alpha, beta, gamma]: readonly [number, number, number]): [number, number, number] {
  let a = wrap180(alpha);
  let b = wrap180(beta);
  let g = wrap180(gamma);
  if (b < 0) {
    b = -b;
    a = wrap180(a + 180);
    g = wrap180(g + 180);
  }
  return [a, b, g];
}

/** The angle in (−180°, 180°]; −0 becomes 0. */
export function wrap180(deg: number): number {
  const r = deg - 360 * Math.ceil((deg - 180) / 360);
  return r === 0 ? 0 : r;
}

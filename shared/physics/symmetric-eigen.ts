/**
 * Eigen-decomposition of a real symmetric n×n matrix by the cyclic Jacobi method
 * (Golub & Van Loan, Matrix Computations, 4th ed., §8.5.2–8.5.3; rotation update as in
 * Numerical Recipes 3rd ed. §11.1). Jacobi is chosen for its accuracy on small matrices —
 * eigenvectors stay orthonormal to rounding even for (nearly) equal eigenvalues, which occur
 * for every near-spherical cloud — and it runs allocation-free on caller-owned arrays, so it
 * can sit inside the energy functional.
 *
 * `a` (row-major, length n², symmetric) is overwritten. On return `values[k]` is the k-th
 * eigenvalue and column k of `vectors` (row-major: vectors[i·n + k]) its unit eigenvector.
 * Eigenvalues come out unsorted. Converges quadratically: 3–4 sweeps for 3×3, ≤ 10 for 7×7.
 */
export function symmetricEigen(a: Float64Array, n: number, values: Float64Array, vectors: Float64Array): void {
  vectors.fill(0, 0, n * n);
  let norm2 = 0;
  for (let i = 0; i < n; i++) {
    vectors[i * n + i] = 1;
    for (let j = 0; j < n; j++) norm2 += a[i * n + j] * a[i * n + j];
  }
  for (let sweep = 0; sweep < 50; sweep++) {
    let off2 = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off2 += a[p * n + q] * a[p * n + q];
    // Off-diagonal mass at the level of double rounding of the whole matrix: done.
    if (off2 <= 1e-32 * norm2) break;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) rotate(a, n, vectors, p, q);
  }
  for (let i = 0; i < n; i++) values[i] = a[i * n + i];
}

/** One Jacobi rotation annihilating a[p][q]. */
function rotate(a: Float64Array, n: number, v: Float64Array, p: number, q: number): void {
  const apq = a[p * n + q];
  if (apq === 0) return;
  const app = a[p * n + p];
  const aqq = a[q * n + q];
  const theta = (aqq - app) / (2 * apq);
  // t = tan of the rotation angle, the smaller root (|angle| ≤ π/4) for stability.
  const t = Math.abs(theta) > 1e150 ? 0.5 / theta : (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(1 + theta * theta));
  const c = 1 / Math.sqrt(1 + t * t);
  const s = t * c;
  a[p * n + p] = app - t * apq;
  a[q * n + q] = aqq + t * apq;
  a[p * n + q] = 0;
  a[q * n + p] = 0;
  for (let r = 0; r < n; r++) {
    if (r !== p && r !== q) {
      const arp = a[r * n + p];
      const arq = a[r * n + q];
      const np = c * arp - s * arq;
      const nq = s * arp + c * arq;
      a[r * n + p] = np;
      a[p * n + r] = np;
      a[r * n + q] = nq;
      a[q * n + r] = nq;
    }
    const vrp = v[r * n + p];
    const vrq = v[r * n + q];
    v[r * n + p] = c * vrp - s * vrq;
    v[r * n + q] = s * vrp + c * vrq;
  }
}

/**
 * The same cyclic Jacobi method for a symmetric 3×3 matrix `m` (row-major, left unchanged),
 * unrolled into scalars: it is the innermost call of the energy functional (two per energy
 * evaluation) and runs about six times faster than the general loop. Same output layout as
 * `symmetricEigen` with n = 3.
 */
export function symmetricEigen3(m: ArrayLike<number>, values: Float64Array, v: Float64Array): void {
  let a00 = m[0], a11 = m[4], a22 = m[8];
  let a01 = m[1], a02 = m[2], a12 = m[5];
  let v00 = 1, v01 = 0, v02 = 0;
  let v10 = 0, v11 = 1, v12 = 0;
  let v20 = 0, v21 = 0, v22 = 1;
  const norm2 = a00 * a00 + a11 * a11 + a22 * a22 + 2 * (a01 * a01 + a02 * a02 + a12 * a12);
  for (let sweep = 0; sweep < 50; sweep++) {
    if (a01 * a01 + a02 * a02 + a12 * a12 <= 1e-32 * norm2) break;
    // Rotations (0,1), (0,2), (1,2); each zeroes its element and updates the third row/column.
    if (a01 !== 0) {
      const th = (a11 - a00) / (2 * a01);
      const t = Math.abs(th) > 1e150 ? 0.5 / th : (th >= 0 ? 1 : -1) / (Math.abs(th) + Math.sqrt(1 + th * th));
      const c = 1 / Math.sqrt(1 + t * t);
      const s = t * c;
      a00 -= t * a01;
      a11 += t * a01;
      a01 = 0;
      const x = c * a02 - s * a12; a12 = s * a02 + c * a12; a02 = x;
      let y;
      y = c * v00 - s * v01; v01 = s * v00 + c * v01; v00 = y;
      y = c * v10 - s * v11; v11 = s * v10 + c * v11; v10 = y;
      y = c * v20 - s * v21; v21 = s * v20 + c * v21; v20 = y;
    }
    if (a02 !== 0) {
      const th = (a22 - a00) / (2 * a02);
      const t = Math.abs(th) > 1e150 ? 0.5 / th : (th >= 0 ? 1 : -1) / (Math.abs(th) + Math.sqrt(1 + th * th));
      const c = 1 / Math.sqrt(1 + t * t);
      const s = t * c;
      a00 -= t * a02;
      a22 += t * a02;
      a02 = 0;
      const x = c * a01 - s * a12; a12 = s * a01 + c * a12; a01 = x;
      let y;
      y = c * v00 - s * v02; v02 = s * v00 + c * v02; v00 = y;
      y = c * v10 - s * v12; v12 = s * v10 + c * v12; v10 = y;
      y = c * v20 - s * v22; v22 = s * v20 + c * v22; v20 = y;
    }
    if (a12 !== 0) {
      const th = (a22 - a11) / (2 * a12);
      const t = Math.abs(th) > 1e150 ? 0.5 / th : (th >= 0 ? 1 : -1) / (Math.abs(th) + Math.sqrt(1 + th * th));
      const c = 1 / Math.sqrt(1 + t * t);
      const s = t * c;
      a11 -= t * a12;
      a22 += t * a12;
      a12 = 0;
      const x = c * a01 - s * a02; a02 = s * a01 + c * a02; a01 = x;
      let y;
      y = c * v01 - s * v02; v02 = s * v01 + c * v02; v01 = y;
      y = c * v11 - s * v12; v12 = s * v11 + c * v12; v11 = y;
      y = c * v21 - s * v22; v22 = s * v21 + c * v22; v21 = y;
    }
  }
  values[0] = a00; values[1] = a11; values[2] = a22;
  v[0] = v00; v[1] = v01; v[2] = v02; v[3] = v10; v[4] = v11; v[5] = v12; v[6] = v20; v[7] = v21; v[8] = v22;
}

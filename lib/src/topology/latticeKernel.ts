/**
 * Hot loops of the lattice skyrmion number (Berg-Luescher solid angles), on typed arrays with no
 * allocation. They work on a row range [j0, j1) of plaquette rows of one layer so that worker threads
 * can split a field by rows. Hand-written (no library does this for TypeScript).
 *
 * Plaquette (i, j) has corners a = (i, j), b = (i+1, j), c = (i+1, j+1), d = (i, j+1) (indices wrap
 * on periodic axes). It is split into two counterclockwise triangles:
 *   square lattice:     (a, b, c) and (a, c, d)
 *   triangular lattice: (a, b, d) and (b, c, d)  (the two equilateral triangles of the rhombus)
 * Each triangle adds Omega = 2 atan2(m1.(m2 x m3), 1 + m1.m2 + m2.m3 + m3.m1) (see solidAngle.ts).
 * On a square grid the first-order expansion of the two triangles gives m.(d_x m x d_y m) dx dy, so
 * Sum Omega / 4 pi -> Q = (1/4 pi) Int m.(d_x m x d_y m) dx dy. Source: B. Berg, M. Luescher,
 * Nucl. Phys. B 190, 412 (1981).
 *
 * Speed (test/bench/latticeQ.bench.mjs, interleaved with the best numpy code): the cost is the atan2
 * calls. Per plaquette the two triangle angles are combined into one argument (both denominators
 * positive); on the total-only path (solidAngleSumSquare) up to 16 consecutive plaquettes whose
 * combined angle is below pi/16 in magnitude are multiplied as complex numbers and share one atan2
 * (the sum of their angles stays inside (-pi, pi), so the argument of the product is that sum, not
 * a wrapped value); it also shares one cross product a x c between the two triple products and
 * carries the dot product of the shared edge to the next plaquette. Plaquettes outside that bound (near-antipodal spins, cores on a coarse grid) get
 * their own atan2. The result differs from the one-atan2-a-plaquette sum by rounding only (about
 * 1e-13 on Q = 288 over 4 million plaquettes).
 */

/** Plaquettes whose solid angles share one atan2 in solidAngleSumSquare, and tan(pi / GROUP) rounded down. */
const GROUP = 16;
const TAN_GROUP = 0.198912; // tan(pi / 16) = 0.19891236737...

/**
 * Sum of triangle solid angles (radians) over plaquette rows [j0, j1) of the square-lattice layer that
 * starts at cell `cellBase`, with no vacuum cells. wrapX / wrapY: periodic along x / y.
 * The caller clips j1 to ny (wrapY) or ny - 1 (open).
 */
export function solidAngleSumSquare(m: Float64Array, nx: number, ny: number, cellBase: number, j0: number, j1: number, wrapX: boolean): number {
  const ni = wrapX ? nx : nx - 1;
  let sum = 0;
  for (let j = j0; j < j1; j++) {
    const jn = j + 1 === ny ? 0 : j + 1;
    const ra = (cellBase + j * nx) * 3;
    const rd = (cellBase + jn * nx) * 3;
    let ax = m[ra]!,
      ay = m[ra + 1]!,
      az = m[ra + 2]!;
    let dx = m[rd]!,
      dy = m[rd + 1]!,
      dz = m[rd + 2]!;
    let da = dx * ax + dy * ay + dz * az; // d.a of the left edge: b.c of the plaquette before
    let rowSum = 0;
    let pr = 1,
      pim = 0,
      cnt = 0; // running product of plaquette factors z and how many it holds
    for (let i = 0; i < ni; i++) {
      const off = i + 1 === nx ? 0 : 3 * (i + 1);
      const pb = ra + off,
        pc = rd + off;
      const bx = m[pb]!,
        by = m[pb + 1]!,
        bz = m[pb + 2]!;
      const cx = m[pc]!,
        cy = m[pc + 1]!,
        cz = m[pc + 2]!;
      const ab = ax * bx + ay * by + az * bz;
      const bc = bx * cx + by * cy + bz * cz;
      const ca = cx * ax + cy * ay + cz * az;
      const cd = cx * dx + cy * dy + cz * dz;
      // one cross product u = a x c serves both triple products:
      // a . (b x c) = -b . (a x c) and a . (c x d) = d . (a x c)
      const ux = ay * cz - az * cy,
        uy = az * cx - ax * cz,
        uz = ax * cy - ay * cx;
      const t1 = -(bx * ux + by * uy + bz * uz);
      const t2 = dx * ux + dy * uy + dz * uz;
      const d1 = 1 + ab + bc + ca,
        d2 = 1 + ca + cd + da;
      da = bc;
      if (d1 > 0 && d2 > 0) {
        // Both half-angles lie in (-pi/2, pi/2), so their sum lies in (-pi, pi) and equals the argument of
        // z = (d1 + i t1)(d2 + i t2): one atan2 for the plaquette instead of two. Exact same branch, no wrap.
        const zr = d1 * d2 - t1 * t2,
          zi = t1 * d2 + t2 * d1;
        if (zr > 1e-15 && zr < 1e15 && Math.abs(zi) < TAN_GROUP * zr) {
          // |arg z| < pi / GROUP: multiply z into the running product of this group; the argument of a
          // product of GROUP such factors is the sum of their arguments (it stays inside (-pi, pi)), so one
          // atan2 serves GROUP plaquettes. |z| lies in (1e-15, 1e15): no overflow or underflow in 16 factors.
          const nr = pr * zr - pim * zi;
          pim = pr * zi + pim * zr;
          pr = nr;
          if (++cnt === GROUP) {
            rowSum += Math.atan2(pim, pr);
            pr = 1;
            pim = 0;
            cnt = 0;
          }
        } else rowSum += Math.atan2(zi, zr);
      } else {
        rowSum += Math.atan2(t1, d1) + Math.atan2(t2, d2);
      }
      ax = bx;
      ay = by;
      az = bz;
      dx = cx;
      dy = cy;
      dz = cz;
    }
    if (cnt > 0) rowSum += Math.atan2(pim, pr);
    sum += rowSum;
  }
  return 2 * sum;
}

/**
 * General version: vacuum mask (a triangle with any vacuum corner is skipped), square or triangular
 * lattice, and an optional per-plaquette output `density` (solid angle / 4 pi of each plaquette, index
 * j * px + i with px = wrapX ? nx : nx - 1). When both triangles of a plaquette count and both denominators are
 * positive, one atan2 gives their sum (as in solidAngleSumSquare). Returns the sum of solid angles (radians) and counts the
 * triangles used in `counts[0]` and skipped in `counts[1]` when `counts` is given.
 */
export function solidAngleSumGeneral(
  m: Float64Array,
  vacuum: Uint8Array | null,
  nx: number,
  ny: number,
  cellBase: number,
  j0: number,
  j1: number,
  wrapX: boolean,
  triangular: boolean,
  density: Float64Array | null,
  counts: Float64Array | null,
): number {
  const ni = wrapX ? nx : nx - 1;
  const inv4pi = 1 / (4 * Math.PI);
  let sum = 0;
  let used = 0,
    skipped = 0;
  for (let j = j0; j < j1; j++) {
    const jn = j + 1 === ny ? 0 : j + 1;
    const rowA = cellBase + j * nx;
    const rowD = cellBase + jn * nx;
    // row sums, as in solidAngleSumSquare (a long sum loses less)
    let rowSum = 0;
    for (let i = 0; i < ni; i++) {
      const inext = i + 1 === nx ? 0 : i + 1;
      const ca = rowA + i,
        cb = rowA + inext,
        cc = rowD + inext,
        cd = rowD + i;
      const va = vacuum === null ? 0 : vacuum[ca]!,
        vb = vacuum === null ? 0 : vacuum[cb]!;
      const vc = vacuum === null ? 0 : vacuum[cc]!,
        vd = vacuum === null ? 0 : vacuum[cd]!;
      const pa = 3 * ca,
        pb = 3 * cb,
        pc = 3 * cc,
        pd = 3 * cd;
      const ax = m[pa]!,
        ay = m[pa + 1]!,
        az = m[pa + 2]!;
      const bx = m[pb]!,
        by = m[pb + 1]!,
        bz = m[pb + 2]!;
      const cx = m[pc]!,
        cy = m[pc + 1]!,
        cz = m[pc + 2]!;
      const dx = m[pd]!,
        dy = m[pd + 1]!,
        dz = m[pd + 2]!;
      // the two triangles of the plaquette: (a, b, c), (a, c, d) on the square lattice, (a, b, d),
      // (b, c, d) on the triangular one; t = signed triple product, den = 1 + sum of the dot products
      let use1: boolean;
      let use2: boolean;
      let t1: number;
      let d1: number;
      let t2: number;
      let d2: number;
      if (!triangular) {
        use1 = (va | vb | vc) === 0;
        use2 = (va | vc | vd) === 0;
        // dot products first, as solidAngleSumSquare did before it grouped plaquettes (that path now
        // differs from this one by rounding only, about 1e-13 of Q)
        const ab = ax * bx + ay * by + az * bz;
        const bc = bx * cx + by * cy + bz * cz;
        const ca = cx * ax + cy * ay + cz * az;
        const cd = cx * dx + cy * dy + cz * dz;
        const da = dx * ax + dy * ay + dz * az;
        t1 = ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
        d1 = 1 + ab + bc + ca;
        t2 = ax * (cy * dz - cz * dy) + ay * (cz * dx - cx * dz) + az * (cx * dy - cy * dx);
        d2 = 1 + ca + cd + da;
      } else {
        use1 = (va | vb | vd) === 0;
        use2 = (vb | vc | vd) === 0;
        const bd = bx * dx + by * dy + bz * dz;
        t1 = ax * (by * dz - bz * dy) + ay * (bz * dx - bx * dz) + az * (bx * dy - by * dx);
        d1 = 1 + ax * bx + ay * by + az * bz + bd + dx * ax + dy * ay + dz * az;
        t2 = bx * (cy * dz - cz * dy) + by * (cz * dx - cx * dz) + bz * (cx * dy - cy * dx);
        d2 = 1 + bx * cx + by * cy + bz * cz + cx * dx + cy * dy + cz * dz + bd;
      }
      let omega: number;
      if (use1 && use2) {
        used += 2;
        // as in solidAngleSumSquare: with both denominators positive both half-angles lie in
        // (-pi/2, pi/2), their sum in (-pi, pi), and it is the argument of (d1 + i t1)(d2 + i t2)
        omega = d1 > 0 && d2 > 0 ? Math.atan2(t1 * d2 + t2 * d1, d1 * d2 - t1 * t2) : Math.atan2(t1, d1) + Math.atan2(t2, d2);
      } else {
        omega = 0;
        if (use1) {
          omega += Math.atan2(t1, d1);
          used++;
        } else skipped++;
        if (use2) {
          omega += Math.atan2(t2, d2);
          used++;
        } else skipped++;
      }
      rowSum += omega;
      omega *= 2;
      if (density !== null) density[j * ni + i] = omega * inv4pi;
    }
    sum += 2 * rowSum;
  }
  if (counts !== null) {
    counts[0]! += used;
    counts[1]! += skipped;
  }
  return sum;
}

/**
 * Signed solid angle of the spherical triangle spanned by three unit vectors:
 *   Omega = 2 atan2( m1 . (m2 x m3), 1 + m1.m2 + m2.m3 + m3.m1 ),   -2 pi < Omega <= 2 pi.
 * Positive when m1 -> m2 -> m3 runs counterclockwise seen from outside the sphere.
 * Sources: A. Van Oosterom, J. Strackee, IEEE Trans. Biomed. Eng. 30, 125 (1983) (the formula);
 * B. Berg, M. Luescher, Nucl. Phys. B 190, 412 (1981) (its use as a lattice topological density).
 */
export function triangleSolidAngle(ax: number, ay: number, az: number, bx: number, by: number, bz: number, cx: number, cy: number, cz: number): number {
  const triple = ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
  const denom = 1 + ax * bx + ay * by + az * bz + bx * cx + by * cy + bz * cz + cx * ax + cy * ay + cz * az;
  return 2 * Math.atan2(triple, denom);
}

/** The same for vectors given as arrays [x, y, z]. */
export function solidAngle(a: ArrayLike<number>, b: ArrayLike<number>, c: ArrayLike<number>): number {
  return triangleSolidAngle(a[0]!, a[1]!, a[2]!, b[0]!, b[1]!, b[2]!, c[0]!, c[1]!, c[2]!);
}

/**
 * Seeded random smooth fields for tests: each component is a sum of a few periodic Fourier modes on
 * the nx x ny box (so the field is smooth on the torus). Not normalized (the code under test does it).
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function randomSmoothComponents(nx: number, ny: number, seed: number, modes = 4, kmax = 3, bias: [number, number, number] = [0, 0, 0]): Float64Array {
  const rnd = mulberry32(seed);
  const out = new Float64Array(3 * nx * ny);
  for (let comp = 0; comp < 3; comp++) {
    const terms = Array.from({ length: modes }, () => ({
      kx: Math.floor(rnd() * (2 * kmax + 1)) - kmax,
      ky: Math.floor(rnd() * (2 * kmax + 1)) - kmax,
      A: rnd() * 2 - 1,
      p: rnd() * 2 * Math.PI,
    }));
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        let s = bias[comp]!;
        for (const t of terms) s += t.A * Math.cos(2 * Math.PI * ((t.kx * i) / nx + (t.ky * j) / ny) + t.p);
        out[3 * (j * nx + i) + comp] = s;
      }
    }
  }
  return out;
}

/** Rotation matrix of a unit quaternion (w, x, y, z) made from 4 numbers. */
export function rotationFromQuaternion(q: [number, number, number, number]): number[][] {
  const n = Math.hypot(...q);
  const [w, x, y, z] = q.map((v) => v / n) as [number, number, number, number];
  return [
    [1 - 2 * (y * y + z * z), 2 * (x * y - w * z), 2 * (x * z + w * y)],
    [2 * (x * y + w * z), 1 - 2 * (x * x + z * z), 2 * (y * z - w * x)],
    [2 * (x * z - w * y), 2 * (y * z + w * x), 1 - 2 * (x * x + y * y)],
  ];
}

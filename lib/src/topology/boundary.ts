/** Boundary conditions of a lattice texture. */
import { InputError } from "../errors.js";

/**
 * "periodic": periodic along x and y (a torus: the lattice skyrmion number is then an exact integer);
 * "open": no wrap (the sum runs over interior plaquettes only); "periodic-x" / "periodic-y": a strip.
 */
export type Boundary = "periodic" | "open" | "periodic-x" | "periodic-y";

export const BOUNDARIES: readonly Boundary[] = ["periodic", "open", "periodic-x", "periodic-y"];

export function wrapFlags(boundary: Boundary | undefined): { wrapX: boolean; wrapY: boolean; boundary: Boundary } {
  const b = boundary ?? "periodic";
  if (!BOUNDARIES.includes(b)) throw new InputError("boundary", boundary, `one of ${BOUNDARIES.map((s) => `"${s}"`).join(", ")}`);
  return { wrapX: b === "periodic" || b === "periodic-x", wrapY: b === "periodic" || b === "periodic-y", boundary: b };
}

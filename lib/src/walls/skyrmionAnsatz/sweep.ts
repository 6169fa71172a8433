/**
 * The ansatz skyrmion over a field sweep (see ../skyrmionAnsatz.ts): one warm-started solve per
 * field, and the branches of minima followed by continuation up and down in field, with their ends.
 */
import { ConvergenceError, InputError } from "../../errors.js";
import type { Film } from "../../material/film.js";
import type { AnsatzOptions } from "./energy.js";
import { findAnsatzMinima, type AnsatzStart, type AnsatzState } from "./search.js";
import { solveSkyrmionAnsatz, type AnsatzSkyrmion } from "./solve.js";

/** xs[i], checked: a RangeError names the index when it is outside the array (a bug, not bad input). */
function item<T>(xs: ArrayLike<T>, i: number): T {
  const x = xs[i];
  if (x === undefined) throw new RangeError(`index ${i} outside 0 .. ${xs.length - 1}`);
  return x;
}

/** m.get(k), checked: every key looked up here was set before. */
function entry<K, V>(m: ReadonlyMap<K, V>, k: K): V {
  const v = m.get(k);
  if (v === undefined) throw new RangeError("a branch map has no entry for a state it listed");
  return v;
}

/** A field sweep of the ansatz skyrmion: one solve per field, warm-started from the last state. */
export interface AnsatzSweep {
  fields: number[];
  results: AnsatzSkyrmion[];
}

/**
 * Solve at each field of `fields` (T) in the order given: every field gets the global search; the
 * state reported is the one continued from the previous field's state (nearest in ln R) when there
 * is one, else the lowest in energy. Points without a minimum carry their status.
 */
export function skyrmionFieldSweep(film: Film, fields: ArrayLike<number>, options: Omit<AnsatzOptions, "startRadius" | "startWidth"> = {}): AnsatzSweep {
  const results: AnsatzSkyrmion[] = [];
  const fs: number[] = [];
  let start: AnsatzStart | undefined;
  for (let i = 0; i < fields.length; i++) {
    const B = fields[i];
    if (B === undefined || !Number.isFinite(B)) throw new InputError(`fields[${i}]`, B, "a finite field in T");
    const r = solveSkyrmionAnsatz(film, B, start ? { ...options, startRadius: start.radius, startWidth: start.wallWidth } : options);
    if (r.status === "ok") start = { radius: r.radius, wallWidth: r.wallWidth };
    results.push(r);
    fs.push(B);
  }
  return { fields: fs, results };
}

/** One end of a branch inside the swept range. */
export interface BranchEnd {
  /** Boundary field (T): the middle of the final bracket between a field with and one without the state. */
  field: number;
  /** Half-width of the final bracket (T): the boundary lies within field +- resolution. */
  resolution: number;
  /** Last field (T) at which the state was verified. */
  lastField: number;
  /**
   * "expansion": beyond it the energy decreases towards R / w = 100 (run-away expansion or a bubble
   * larger than the window); "below-window": towards R / w = 0.3 (a smaller continuum minimum or none
   * the ansatz can hold); "fold": the minimum merges with a saddle and disappears (the state goes to
   * another minimum).
   */
  kind: "expansion" | "below-window" | "fold";
}

/** A branch of minima followed through the field sweep by continuation. */
export interface SkyrmionBranch {
  /** 1, 2, ... in order of increasing radius at the branch's middle field. */
  id: number;
  /** "compact skyrmion" (R / w < 4 throughout), "bubble" (R / w > 4 throughout) or "skyrmion-bubble". */
  label: string;
  fields: number[];
  states: AnsatzState[];
  /** End of the branch towards lower field (undefined when it reaches the first field of the sweep). */
  lowerEnd?: BranchEnd;
  /** End towards higher field (undefined when it reaches the last field). */
  upperEnd?: BranchEnd;
}

export interface SkyrmionBranchSweep {
  /** Fields (T), ascending. */
  fields: number[];
  branches: SkyrmionBranch[];
  /** Branch id of each verified minimum at each field (parallel to `fields`). */
  perField: Array<Array<{ branch: number; state: AnsatzState }>>;
  /** Absolute tolerance (T) of the boundary bisections. */
  boundaryTolerance: number;
  evaluations: number;
}

/** Largest |ln R| or |ln w| change accepted as one continuation step. */
const CONTINUATION_JUMP = 0.25;

/**
 * Follow a minimum from field Bfrom to Bto by continuation with step control: each step is accepted
 * when the local search from the current state finds a verified minimum within CONTINUATION_JUMP in
 * ln R and ln w; otherwise the step is halved. When the step falls below `tol` the state ends there.
 */
function followState(
  film: Film,
  opts: AnsatzOptions,
  state: AnsatzState,
  Bfrom: number,
  Bto: number,
  tol: number,
  count: { evals: number },
): { reached: AnsatzState } | { end: BranchEnd } {
  let cur = state;
  let B = Bfrom;
  let step = Bto - Bfrom;
  const full = Math.abs(step);
  for (let guard = 0; guard < 400; guard++) {
    if (B === Bto) return { reached: cur };
    const target = Math.abs(step) >= Math.abs(Bto - B) ? Bto : B + step;
    const sr = findAnsatzMinima(film, target, { ...opts, starts: [cur], scan: false });
    count.evals += sr.evaluations;
    let cand: AnsatzState | undefined;
    for (const m of sr.minima) {
      const dr = Math.abs(Math.log(m.radius / cur.radius));
      const dw = Math.abs(Math.log(m.wallWidth / cur.wallWidth));
      if (dr < CONTINUATION_JUMP && dw < CONTINUATION_JUMP && (!cand || dr < Math.abs(Math.log(cand.radius / cur.radius)))) cand = m;
    }
    if (cand) {
      cur = cand;
      B = target;
      step = Math.sign(step) * Math.min(full, 1.5 * Math.abs(step));
      continue;
    }
    if (Math.abs(step) <= 2 * tol) {
      const kind: BranchEnd["kind"] = sr.decreasesToLargeEdge ? "expansion" : sr.decreasesToSmallEdge ? "below-window" : "fold";
      return { end: { field: B + step / 2, resolution: Math.abs(step) / 2, lastField: B, kind } };
    }
    step /= 2;
  }
  throw new ConvergenceError("skyrmion branch continuation", "no end and no arrival within 400 steps", { Bfrom, Bto, B });
}

/**
 * Follow every verified minimum of the ansatz energy over a field sweep. At each field (ascending) a
 * global search (findAnsatzMinima) lists the minima; each branch alive at the previous field is
 * continued to this one with step control (followState) and matched to the listed minimum it lands
 * on (or adds it); a listed minimum no branch reaches starts a new branch, which is continued
 * downwards the same way until it ends. So every branch is followed both up and down in field, and
 * each end inside the range is located by halving the continuation step down to `boundaryTolerance`
 * (default 1e-6 of the sweep span, at least 1 nT): the ends do not depend on the sweep direction.
 */
export function skyrmionBranches(film: Film, fields: ArrayLike<number>, options: AnsatzOptions & { boundaryTolerance?: number } = {}): SkyrmionBranchSweep {
  const fs = Array.from(fields);
  fs.forEach((B, i) => {
    if (!Number.isFinite(B)) throw new InputError(`fields[${i}]`, B, "a finite field in T");
  });
  fs.sort((x, y) => x - y);
  for (let i = fs.length - 1; i > 0; i--) if (fs[i] === fs[i - 1]) fs.splice(i, 1);
  const n = fs.length;
  if (n < 2) throw new InputError("fields", n, "at least two different fields");
  const span = item(fs, n - 1) - item(fs, 0);
  const tol = options.boundaryTolerance ?? Math.max(1e-9, 1e-6 * span);
  const count = { evals: 0 };
  const opts: AnsatzOptions = { nonlocal: options.nonlocal, helicity: options.helicity };
  interface Raw {
    idx: number[];
    states: AnsatzState[];
    lowerEnd?: BranchEnd;
    upperEnd?: BranchEnd;
    alive: boolean;
  }
  const raws: Raw[] = [];
  const per: AnsatzState[][] = [];
  const owner: Array<Map<AnsatzState, Raw>> = [];
  const matchOrAdd = (i: number, st: AnsatzState): AnsatzState => {
    const hit = item(per, i).find((m) => Math.abs(Math.log(m.radius / st.radius)) < 1e-3 && Math.abs(Math.log(m.wallWidth / st.wallWidth)) < 1e-3);
    if (hit) return hit;
    item(per, i).push(st);
    item(per, i).sort((p, q) => p.radius - q.radius);
    return st;
  };
  for (let i = 0; i < n; i++) {
    const prevStates = i > 0 ? item(per, i - 1) : [];
    const sr = findAnsatzMinima(film, item(fs, i), { ...opts, starts: prevStates });
    count.evals += sr.evaluations;
    per.push([...sr.minima]);
    owner.push(new Map());
    for (const r of raws) {
      if (!r.alive) continue;
      const res = followState(film, opts, item(r.states, r.states.length - 1), item(fs, i - 1), item(fs, i), tol, count);
      if ("end" in res) {
        r.upperEnd = res.end;
        r.alive = false;
        continue;
      }
      const st = matchOrAdd(i, res.reached);
      if (item(owner, i).has(st)) {
        // two branches land on the same minimum: the later one ends (merges) here
        r.upperEnd = { field: item(fs, i), resolution: item(fs, i) - item(fs, i - 1), lastField: item(fs, i - 1), kind: "fold" };
        r.alive = false;
        continue;
      }
      item(owner, i).set(st, r);
      r.idx.push(i);
      r.states.push(st);
    }
    for (const st of [...item(per, i)]) {
      if (item(owner, i).has(st)) continue;
      const r: Raw = { idx: [i], states: [st], alive: true };
      raws.push(r);
      item(owner, i).set(st, r);
      // continue downwards
      let j = i;
      while (j > 0) {
        const res = followState(film, opts, item(r.states, 0), item(fs, j), item(fs, j - 1), tol, count);
        if ("end" in res) {
          r.lowerEnd = res.end;
          break;
        }
        const sj = matchOrAdd(j - 1, res.reached);
        if (item(owner, j - 1).has(sj)) {
          r.lowerEnd = { field: item(fs, j - 1), resolution: item(fs, j) - item(fs, j - 1), lastField: item(fs, j), kind: "fold" };
          break;
        }
        item(owner, j - 1).set(sj, r);
        r.idx.unshift(j - 1);
        r.states.unshift(sj);
        j--;
      }
    }
  }
  const mid = (r: Raw) => item(r.states, Math.floor(r.states.length / 2)).radius;
  raws.sort((p, q) => mid(p) - mid(q));
  const branches: SkyrmionBranch[] = raws.map((r, k) => {
    const ratios = r.states.map((s) => s.radius / s.wallWidth);
    const label = Math.max(...ratios) < 4 ? "compact skyrmion" : Math.min(...ratios) > 4 ? "bubble" : "skyrmion-bubble";
    const b: SkyrmionBranch = { id: k + 1, label, fields: r.idx.map((i) => item(fs, i)), states: r.states };
    if (r.lowerEnd) b.lowerEnd = r.lowerEnd;
    if (r.upperEnd) b.upperEnd = r.upperEnd;
    return b;
  });
  const idOf = new Map<Raw, number>();
  raws.forEach((r, k) => idOf.set(r, k + 1));
  const perField = per.map((list, i) => list.map((state) => ({ state, branch: entry(idOf, entry(item(owner, i), state)) })));
  return { fields: fs, branches, perField, boundaryTolerance: tol, evaluations: count.evals };
}

/**
 * Explorers propagate the uncertainties of their inputs (a film file's): the ± the kernel-side
 * explorer computes (kernel-ext/src/widgets/explorer.ts) and the ± the page's compute job computes
 * (widgets/src/compute/runJob.ts, what the Web Worker runs in an exported page) are runCalculator's
 * first-order ones at the same point, the slider moves the value and keeps the uncertainty, and the
 * wall width's ± meets the first-order formula worked by hand.
 */
import { describe, it, expect, beforeEach } from "vitest";
import { join } from "node:path";
import { comms, type CommChannel } from "../../../kernel-ext/src/comm/comms";
import { explore } from "../../../kernel-ext/src/widgets/index";
import { runJob } from "../../../widgets/src/compute/runJob";
import type { ComputeJob } from "../../../widgets/src/compute/job";
import { filmInputsFor, getCalculator, loadFilm, runCalculator, InputError, type CalculatorResult } from "../../../lib/src/index";

const channel: CommChannel = { send: () => undefined };
beforeEach(() => {
  comms.channel = channel;
});

const filmPath = join(__dirname, "../../../notebooks/data/zx3-film.json");
const uOf = (r: CalculatorResult, name: string) => (r.outputs as Record<string, { value: unknown; uncertainty?: number }>)[name]!.uncertainty;

function pageResult(job: Omit<ComputeJob, "seq">): CalculatorResult {
  const o = runJob({ ...job, seq: 1 });
  if (!o.ok) throw new Error(o.error);
  return o.result;
}

describe("an explorer opened with a film file's uncertainties", () => {
  it("shows the skyrmion radius ± runCalculator's first-order uncertainty, in the kernel and in the page's compute job", () => {
    const film = loadFilm(filmPath);
    const spec = getCalculator("skyrmion");
    const fromFile = filmInputsFor(spec, film);
    const direct = runCalculator(spec, fromFile.inputs, { noSweep: true, uncertainty: fromFile.uncertainty });
    const uDirect = uOf(direct, "radius")!;
    expect(uDirect).toBeGreaterThan(0);

    const ex = explore("skyrmion", film);
    expect(ex.uncertainties).toEqual({ A: 1e-12, Ku: 4e4, D: 1e-4 });
    expect(ex.get("correlations")).toEqual([{ between: ["A", "Ku"], coefficient: 0.3 }]);
    const kernel = ex.result!;
    expect(kernel.uncertainty?.method).toBe("first-order");
    expect(kernel.outputs.radius.value).toBeCloseTo(direct.outputs.radius.value, 15);
    // same inputs, same library, same runs: the same number (to rounding of the unit conversions)
    expect(uOf(kernel, "radius")! / uDirect).toBeCloseTo(1, 9);
    expect(uOf(kernel, "wallWidth")! / uOf(direct, "wallWidth")!).toBeCloseTo(1, 9);

    const page = pageResult({ calculator: "skyrmion", inputs: ex.inputs, sweep: ex.get("sweep"), uncertainties: ex.uncertainties, correlations: ex.get("correlations") });
    expect(uOf(page, "radius")! / uDirect).toBeCloseTo(1, 9);
    expect(page.uncertainty?.flagged).toEqual(direct.uncertainty?.flagged);
    // propagated at the point only: the sweep is computed once (the curves), then the point without it
    // and the 2n = 6 runs at x_i ± u_i of A, Ku and D
    expect(page.sweep).toBeDefined();
    expect(page.uncertainty?.evaluations).toBe(1 + 1 + 6);
  });

  it("a moved slider moves the value and keeps the uncertainty: the page's ± is runCalculator's at the new point", () => {
    const film = loadFilm(filmPath);
    const ex = explore("skyrmion", film);
    const moved = { ...ex.inputs, D: 3.2e-3 };
    const page = pageResult({ calculator: "skyrmion", inputs: moved, sweep: null, noSweep: true, uncertainties: ex.uncertainties, correlations: ex.get("correlations") });
    const direct = runCalculator(
      "skyrmion",
      { ...moved, A: { value: moved.A!, uncertainty: 1e-12 }, Ku: { value: moved.Ku!, uncertainty: 4e4 }, D: "3.2 ± 0.1 mJ/m^2" },
      { noSweep: true, uncertainty: { correlations: [{ between: ["A", "Ku"], coefficient: 0.3 }] } },
    );
    expect(uOf(page, "radius")! / uOf(direct, "radius")!).toBeCloseTo(1, 9);
    expect(page.inputs.D!.value).toBe(3.2e-3);
    expect((page.inputs.D as { uncertainty?: number }).uncertainty).toBe(1e-4);
    // and it is not the ± of the first point (the radius depends on D)
    expect(Math.abs(uOf(page, "radius")! / uOf(ex.result!, "radius")! - 1)).toBeGreaterThan(0.01);
  });

  it("meets the first-order formula for the wall width Δ = √(A/K_eff) with correlated A and Ku", () => {
    // JCGM 100:2008 (GUM) eq. (13): u²(Δ) = (∂Δ/∂A)² u_A² + (∂Δ/∂K)² u_K² + 2 r ∂Δ/∂A ∂Δ/∂K u_A u_K, with
    // ∂Δ/∂A = Δ/(2A) and ∂Δ/∂Ku = -Δ/(2 K_eff), K_eff = Ku - μ0 Ms²/2 (A. Hubert, R. Schäfer, Magnetic
    // Domains (Springer 1998), sec. 3.6.1: Δ = √(A/K)). The library takes secants over ±u: they differ from
    // the derivatives by terms of order (u/x)², under 0.5 % here.
    const mu0 = 1.25663706212e-6; // CODATA 2018
    const [Ms, A, Ku, uA, uK, r] = [1.1e6, 15e-12, 1.2e6, 1e-12, 4e4, 0.3];
    const K = Ku - (mu0 * Ms * Ms) / 2;
    const delta = Math.sqrt(A / K);
    const a = uA / A / 2;
    const k = uK / K / 2;
    const expected = delta * Math.sqrt(a * a + k * k - 2 * r * a * k);
    const ex = explore("wall", loadFilm(filmPath));
    expect(ex.result!.outputs.width.value / delta).toBeCloseTo(1, 6);
    expect(uOf(ex.result!, "width")! / expected).toBeCloseTo(1, 2);
    const page = pageResult({ calculator: "wall", inputs: ex.inputs, sweep: null, uncertainties: ex.uncertainties, correlations: ex.get("correlations") });
    expect(uOf(page, "width")! / expected).toBeCloseTo(1, 2);
  });

  it("computed in the kernel (live): a page's slider change is answered with the ± at the new point", () => {
    const ex = explore("wall", loadFilm(filmPath), { computeIn: "kernel" });
    const moved = { ...ex.inputs, A: 17e-12 };
    comms.handleMessage({ comm_id: ex.id, data: { method: "update", state: { inputs: moved }, buffer_paths: [] } }, { metadata: {}, buffers: [], header: { msg_id: "x" } });
    const direct = runCalculator(
      "wall",
      { ...moved, A: "17 ± 1 pJ/m", Ku: "1.2 ± 0.04 MJ/m^3", D: "2.9 ± 0.1 mJ/m^2" },
      { uncertainty: { correlations: [{ between: ["A", "Ku"], coefficient: 0.3 }] } },
    );
    expect(ex.result!.inputs.A!.value).toBe(17e-12);
    expect(uOf(ex.result!, "width")! / uOf(direct, "width")!).toBeCloseTo(1, 9);
    // kernel code changing a value and its uncertainty together: one computation; the uncertainty alone: one more
    let results = 0;
    ex.onResult(() => results++);
    ex.setInputs({ A: "16 ± 2 pJ/m" });
    expect(results).toBe(1);
    ex.setInputs({ A: "16 ± 3 pJ/m" });
    expect(results).toBe(2);
    expect((ex.result!.inputs.A as { uncertainty?: number }).uncertainty).toBe(3e-12);
  });

  it("setInputs keeps an input's uncertainty for a plain value and replaces it for a value with ±", () => {
    const ex = explore("wall", { Ms: "1.1 MA/m", A: "15 ± 1 pJ/m", Ku: "1.2 MJ/m^3", D: "2.9 mJ/m^2", t: "1 nm" });
    expect(ex.uncertainties).toEqual({ A: 1e-12 });
    ex.setInputs({ A: "16 pJ/m" });
    expect(ex.uncertainties).toEqual({ A: 1e-12 });
    expect((ex.result!.inputs.A as { uncertainty?: number }).uncertainty).toBe(1e-12);
    ex.setInputs({ A: "16 ± 2 pJ/m" });
    expect(ex.uncertainties).toEqual({ A: 2e-12 });
    ex.setInputs({ A: "16 ± 0 pJ/m" });
    expect(ex.uncertainties).toEqual({});
    expect(ex.result!.uncertainty).toBeUndefined();
  });

  it("refuses an uncertainty on a choice input, naming it, in the page's compute job", () => {
    const spec = getCalculator("texture");
    const choice = spec.inputs.find((i) => i.kind === "choice")!;
    const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
    const o = runJob({ seq: 1, calculator: "texture", inputs, sweep: null, uncertainties: { [choice.name]: 1 } });
    expect(o.ok).toBe(false);
    expect(!o.ok && o.parameter).toBe(choice.name);
    expect(() => runCalculator("texture", { [choice.name]: { value: choice.default, uncertainty: 1 } })).toThrow(InputError);
  });
});

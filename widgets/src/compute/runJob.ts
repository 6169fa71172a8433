/** Run one compute job with the bundled @helicoid/lib (in the worker, or on the page as fallback). */
import { anyUncertainty, getCalculator, runCalculator, withUncertainties, InputError } from "@helicoid/lib";
import type { ComputeJob, ComputeOutcome } from "./job.js";

export function runJob(job: ComputeJob): ComputeOutcome {
  const t0 = performance.now();
  try {
    const spec = getCalculator(job.calculator);
    const sweep = job.sweep ? { sweep: job.sweep } : job.noSweep ? { noSweep: true } : {};
    // inputs with uncertainties: first-order propagation at this point (the library's, as in the kernel)
    const result = anyUncertainty(job.uncertainties)
      ? runCalculator(spec, withUncertainties(job.inputs, job.uncertainties), { ...sweep, uncertainty: { correlations: job.correlations ?? [] } })
      : runCalculator(spec, job.inputs, sweep);
    return { seq: job.seq, ok: true, result, ms: performance.now() - t0 };
  } catch (err) {
    const e = err as Error;
    const out: ComputeOutcome = { seq: job.seq, ok: false, error: e?.message ?? String(err), ms: performance.now() - t0 };
    if (err instanceof InputError) out.parameter = err.parameter;
    return out;
  }
}

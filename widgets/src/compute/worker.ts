/**
 * The compute worker: recomputes catalogue calculators off the page's main thread so that a
 * moving slider never freezes the page. Bundled separately and started from a Blob URL.
 */
import { runJob } from "./runJob.js";
import type { ComputeJob } from "./job.js";

const scope = self as unknown as { onmessage: (e: MessageEvent<ComputeJob>) => void; postMessage: (m: unknown) => void };
scope.onmessage = (e) => {
  scope.postMessage(runJob(e.data));
};

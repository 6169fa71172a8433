/**
 * A recompute job for a catalogue calculator and its outcome: the messages between the explorer
 * view and the compute worker. Plain JSON both ways.
 */
import type { CalculatorResult, InputCorrelation, SweepRange } from "@helicoid/lib";

/** A sweep request: the library's one sweep shape. */
export type SweepRequest = SweepRange;

export interface ComputeJob {
  /** Sequence number: the view keeps only the newest answer. */
  seq: number;
  /** Catalogue id of the calculator. */
  calculator: string;
  /** SI inputs. */
  inputs: Record<string, number>;
  sweep: SweepRequest | null;
  /** "no sweep" chosen: compute without the spec's default sweep (no swept arrays). */
  noSweep?: boolean;
  /**
   * SI standard uncertainties of inputs (a film file's): the result carries the outputs' uncertainties
   * propagated to first order at this point (2n+1 single-point runs, never over the sweep).
   */
  uncertainties?: Record<string, number>;
  /** Correlation coefficients between uncertain inputs. */
  correlations?: InputCorrelation[];
}

export type ComputeOutcome = { seq: number; ok: true; result: CalculatorResult; ms: number } | { seq: number; ok: false; error: string; parameter?: string; ms: number };

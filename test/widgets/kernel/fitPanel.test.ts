/**
 * fitPanel takes a profile fit: `fitPanel(fit, { data })` shows fitProfile's result as it is, and a
 * panel that runs the fit (`fitPanel({ data, model, fit })`, or "Start fit" on a shown one) gets the
 * same answer on a worker thread, with progress on the way, and stops when asked. The data are the
 * invented stray-field scan of notebook 02; the fit is checked against the values the invented data
 * were generated with (the file's header: Neel wall, toward the up domain, so neel = cos(helicity) = +1;
 * h = 60 nm held; the wall width parameter sqrt(A/K_eff) of the header's film).
 */
import { describe, it, expect, beforeEach } from "vitest";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { comms, type CommChannel } from "../../../kernel-ext/src/comm/comms";
import { fitPanel } from "../../../kernel-ext/src/widgets/index";
import { fitProfile, readProfileCsv, InputError } from "../../../lib/src/index";

const channel: CommChannel = { send: () => undefined };
beforeEach(() => {
  comms.channel = channel;
});

const nm = 1e-9;
const stray = readProfileCsv(readFileSync(join(__dirname, "../../../notebooks/data/qf7-wall-stray-field.csv"), "utf8"), { source: "qf7-wall-stray-field.csv" });
const options = {
  start: { x0: 0, Delta: 20 * nm, neel: 0, h: 60 * nm, offset: 0 },
  fixed: { t: 1.5 * nm, Ms: 0.6e6, blur: 0, h: 60 * nm },
  bounds: { neel: [-1.5, 1.5] as [number, number] },
};

describe("fitPanel of a profile fit", () => {
  it("shows fitProfile's result: data, model, residuals, parameters ± standard errors, chi-square", () => {
    const fit = fitProfile(stray, "wall180-bz", options);
    // the header's invented film: Delta = sqrt(A / (Ku - mu0 Ms^2 / 2)) (A. Hubert, R. Schäfer, Magnetic Domains, sec. 3.6.1)
    const mu0 = 1.25663706212e-6; // CODATA 2018
    const delta = Math.sqrt(15e-12 / (0.35e6 - (mu0 * 0.6e6 * 0.6e6) / 2));
    expect(fit.parameters.neel.value).toBeGreaterThan(0.8);
    expect(Math.abs(fit.parameters.Delta.value / delta - 1)).toBeLessThan(0.1);
    const p = fitPanel(fit, { data: stray, title: "invented stray-field fit", yLabel: "B_z" });
    expect(p.get("title")).toBe("invented stray-field fit");
    expect(p.get("x")).toEqual(stray.x);
    expect(p.get("y")).toEqual(stray.y);
    expect(p.get("yErr")).toEqual(stray.sigma);
    expect(p.get("yUnit")).toBe("T");
    expect(p.get("modelY")).toEqual(fit.fitted);
    expect(p.get("residuals")).toEqual(fit.residuals);
    expect(p.get("status")).toBe("done");
    expect(p.get("reducedChi2")).toBe(fit.chiSquareReduced);
    const neel = p.get("parameters").find((r) => r.name === "neel")!;
    expect(neel.value).toBe(fit.parameters.neel.value);
    expect(neel.uncertainty).toBe(fit.parameters.neel.stderr);
    expect(p.get("parameters").find((r) => r.name === "h")!.fixed).toBe(true);
    expect(p.result).toBe(fit);
  });

  it("refuses a fit without its data, naming it", () => {
    const fit = fitProfile(stray, "wall180-bz", options);
    expect(() => fitPanel(fit, {} as never)).toThrow(InputError);
    expect(() => fitPanel(fit, { data: { x: [0, 1], y: [0, 1] } })).toThrow(/data\.x/);
    expect(() => fitPanel({ data: stray, model: "no-such-model" })).toThrow(/model/);
  });

  it("runs the fit on a worker thread with progress, and gets fitProfile's answer", async () => {
    const seen: number[] = [];
    const p = fitPanel({ data: stray, model: "wall180-bz", fit: options, title: "invented" });
    p.onChange("iterations", (v) => seen.push(v));
    expect(p.get("status")).toBe("running");
    const r = (await p.done)!;
    const direct = fitProfile(stray, "wall180-bz", options);
    expect(r.parameters.neel.value).toBeCloseTo(direct.parameters.neel.value, 12);
    expect(r.parameters.Delta.stderr! / direct.parameters.Delta.stderr!).toBeCloseTo(1, 9);
    expect(p.get("status")).toBe("done");
    expect(p.get("progress")).toBe(1);
    expect(p.get("title")).toBe("invented");
    expect(p.get("modelY")).toEqual(r.fitted);
    // progress came while it ran: the iteration count rose before the result
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.slice(0, -1).some((k) => k > 0)).toBe(true);
  });

  it("Start fit reruns a shown fit; Stop ends a running one (status 'stopped')", async () => {
    const shown = fitPanel(fitProfile(stray, "wall180-bz", options), { data: stray, fit: options });
    comms.handleMessage({ comm_id: shown.id, data: { method: "custom", content: { event: "start" } } }, { metadata: {}, buffers: [], header: {} });
    expect(shown.get("status")).toBe("running");
    // the stop flag is set before the worker takes the job: the solver stops at its first check
    comms.handleMessage({ comm_id: shown.id, data: { method: "custom", content: { event: "stop" } } }, { metadata: {}, buffers: [], header: {} });
    const r = (await shown.done)!;
    expect(r.status).toBe("stopped");
    expect(shown.get("status")).toBe("stopped");
  });
});

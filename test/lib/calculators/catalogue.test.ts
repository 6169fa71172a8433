/**
 * One name, one symbol, one unit and one meaning per quantity across the catalogue: a table of
 * `wall` and one of `wall-type` must not call two different numbers `neelThreshold`, and a
 * helicity is gamma in radians wherever it appears.
 * Common practice, no source: a quantity keeps its name and symbol throughout one body of work.
 */
import { describe, expect, it } from "vitest";
import { catalogue, getCalculator, runCalculator } from "@helicoid/lib";

type Quantity = { id: string; name: string; symbol: string; unit: string; meaning: string };
const all: Quantity[] = catalogue.flatMap((s) => [...s.inputs, ...s.outputs].map((q) => ({ id: s.id, name: q.name, symbol: q.symbol, unit: q.unit, meaning: q.meaning })));

describe("catalogue: one name and symbol per quantity", () => {
  it("a name with one unit has one symbol in every calculator that uses it (spin-model inputs excepted)", () => {
    // Spin models write energies as D/k_B in K and fields as B; a film's field is mu0 H. Those are
    // different quantities that share a short input name, told apart by their units or models.
    const spinModels = new Set([
      "magnon-hall",
      "easy-plane",
      "spin-tunnel",
      "ion-levels",
      "field-tuned-order",
      "chain-dynamics",
      "wall-band",
      "berry-loop",
      "chern",
      "dipolar-lattice",
      "wall-fit",
    ]);
    const byName = new Map<string, Set<string>>();
    for (const q of all) {
      if (spinModels.has(q.id)) continue;
      const key = `${q.name} [${q.unit}]`;
      byName.set(key, new Set([...(byName.get(key) ?? []), q.symbol]));
    }
    const clashes = [...byName].filter(([, s]) => s.size > 1).map(([k, s]) => `${k}: ${[...s].join(" / ")}`);
    expect(clashes).toEqual([]);
  });

  it("helicity is gamma in rad everywhere; the texture explorer takes 90deg for it, as chern takes it for phi", () => {
    const helicities = all.filter((q) => q.name === "helicity" || q.name === "objectHelicity");
    expect(helicities.map((q) => q.id).sort()).toEqual(["skyrmion", "skyrmion-drift", "texture", "texture", "wall", "wall-type", "wall360"].sort());
    for (const q of helicities) {
      expect(q.symbol.replace(/_i$/, ""), q.id).toBe("\\gamma");
      expect(q.unit, q.id).toBe("rad");
    }
    const r = runCalculator(getCalculator("texture"), { helicity: "90deg", n: 48 });
    expect(r.inputs.helicity!.value).toBeCloseTo(Math.PI / 2, 15);
  });

  it("neelThreshold is the full-kernel value (D_N) and neelThresholdThinFilm the thin-film limit in every calculator", () => {
    for (const id of ["wall", "wall-type"]) {
      const spec = getCalculator(id);
      const n = spec.outputs.find((o) => o.name === "neelThreshold")!;
      const thin = spec.outputs.find((o) => o.name === "neelThresholdThinFilm")!;
      expect(n.symbol).toBe("D_N");
      expect(n.meaning).toMatch(/full thin-film kernel/);
      expect(thin.symbol).toBe("D_N^{(0)}");
      expect(spec.outputs.some((o) => o.name === "neelThresholdFullKernel")).toBe(false);
    }
    const film = { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" };
    const w = runCalculator(getCalculator("wall"), film);
    const t = runCalculator(getCalculator("wall-type"), film);
    expect(w.outputs.neelThreshold!.value).toBe(t.outputs.neelThreshold!.value);
    expect(w.outputs.neelThresholdThinFilm!.value).toBe(t.outputs.neelThresholdThinFilm!.value);
    // the two texts of one result quote the same threshold
    const shown = ((w.outputs.neelThreshold!.value as number) * 1e3).toFixed(3);
    expect(w.outputs.wallType!.value).toContain(`D_N = ${shown}`);
    expect(w.outputs.regime!.value).toContain(`= ${shown} mJ/m^2`);
  });

  it("spiralPeriod is the spin spiral's period (lambda) in wall and skyrmion; 4 pi A / |D| is dmiSpiralPeriod", () => {
    for (const q of all.filter((x) => x.name === "spiralPeriod")) expect(q.symbol, q.id).toBe("\\lambda");
    const w = runCalculator(getCalculator("wall"), { D: "4 mJ/m^2" });
    // Source: closed form L_D = 4 pi A / |D| (e.g. Rohart & Thiaville, PRB 88, 184422 (2013)).
    expect(w.outputs.dmiSpiralPeriod!.value as number).toBeCloseTo((4 * Math.PI * 15e-12) / 4e-3, 20);
  });
});

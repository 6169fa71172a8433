/**
 * The symbol converter (lib/src/plot/symbols.ts, re-exported by widgets/src/views/symbols.ts): the
 * catalogue's LaTeX-like symbols become text plotly draws (Unicode letters, <sub>/<sup>).
 */
import { describe, it, expect } from "vitest";
import { symbolHtml, symbolText, withoutArgument } from "../../../widgets/src/views/symbols";
import { catalogue } from "../../../lib/src/index";

describe("symbols as plotly text", () => {
  it("converts the symbols named in the figures' issue", () => {
    // Common practice, no source: the usual typeset forms of these symbols.
    expect(symbolHtml("\\mu_0 H")).toBe("μ<sub>0</sub> H");
    expect(symbolHtml("\\langle S_z\\rangle")).toBe("⟨S<sub>z</sub>⟩");
    expect(symbolHtml("C_-^{Haldane}(M)")).toBe("C<sub>−</sub><sup>Haldane</sup>(M)");
    expect(symbolHtml("\\log_{10}(\\Delta/k_B\\,[K])")).toBe("log<sub>10</sub>(Δ/k<sub>B</sub>\u2009[K])");
  });
  it("handles fractions, accents, roman text, operators and unknown commands", () => {
    // Common practice, no source.
    expect(symbolHtml("\\frac1N\\sum_q\\int S^{zz}")).toBe("1/N∑<sub>q</sub>∫S<sup>zz</sup>");
    expect(symbolHtml("\\hat R")).toBe("R\u0302");
    expect(symbolHtml("Q_{\\mathrm{fd}}")).toBe("Q<sub>fd</sub>");
    expect(symbolHtml("\\kappa_{xy} \\hbar/(k_B^2 T)")).toBe("κ<sub>xy</sub> ħ/(k<sub>B</sub><sup>2</sup> T)");
    expect(symbolHtml("2J_\\perp|\\sin q|")).toBe("2J<sub>⊥</sub>|sin q|");
    expect(symbolHtml("\\chi^2_\\nu")).toBe("χ<sup>2</sup><sub>ν</sub>");
    expect(symbolHtml("\\weird x")).toBe("weird x");
    expect(symbolText("B_{max}")).toBe("Bmax");
  });
  it("escapes what plotly would read as markup", () => {
    expect(symbolHtml("a<b & c")).toBe("a&lt;b &amp; c");
  });
  it("leaves no backslash or brace in any symbol of the catalogue", () => {
    // Common practice, no source: the page must never show raw markup.
    let n = 0;
    for (const spec of catalogue) {
      for (const q of [...spec.inputs, ...spec.outputs]) {
        if (!q.symbol) continue;
        const html = symbolHtml(q.symbol);
        n++;
        expect(html, `${spec.id}.${q.name}: ${q.symbol}`).not.toMatch(/[\\{}]/);
        // tags are only sub and sup, balanced
        const tags = html.match(/<\/?[a-z]+>/g) ?? [];
        for (const t of tags) expect(t).toMatch(/^<\/?(sub|sup)>$/);
        expect(tags.filter((t) => !t.startsWith("</")).length).toBe(tags.filter((t) => t.startsWith("</")).length);
      }
    }
    expect(n).toBeGreaterThan(100);
  });
  it("drops an argument that is the x quantity", () => {
    expect(withoutArgument("R(B)", "B")).toBe("R");
    expect(withoutArgument("C_-^{Haldane}(M)", "M")).toBe("C_-^{Haldane}");
    expect(withoutArgument("\\log_{10}(\\Delta/k_B\\,[K])", "B_x")).toBe("\\log_{10}(\\Delta/k_B\\,[K])");
    expect(withoutArgument("E_+(K)", "k")).toBe("E_+(K)");
  });
});

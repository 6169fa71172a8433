/**
 * `table(result)`: a result in groups a person reads (inputs, headline results, other results),
 * with symbols and units instead of output ids; statements in words below the table, arrays as
 * one line. The same grouping is the text of `helicoid calc`.
 * Common practice, no source: a results table of a paper names quantities by symbol and unit.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { groupedRows, symbolHtml, symbolPlain, table, TABLE_GROUPS } from "../../../kernel-ext/src/display/table.js";
import { calcCommand } from "../../../kernel-ext/src/cli/calc.js";

const film = { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" };

describe("table(result): grouped, with symbols and units", () => {
  const r = runCalculator(getCalculator("wall"), film);
  const t = table(r);

  it("groups rows as inputs, results, other results; each group named once", () => {
    const sections = t.rows.map((x) => x.section);
    // the groups in order, contiguous
    const order = sections.filter((s, i) => s !== sections[i - 1]);
    expect(order).toEqual([...TABLE_GROUPS]);
    expect(t.rows.filter((x) => x.section === "Inputs").map((x) => x.name)).toEqual(["Ms", "A", "Ku", "D", "t"]);
    expect(t.rows.filter((x) => x.section === "Results").map((x) => x.name)).toEqual(["width", "energy", "criticalDmi", "neelThreshold"]);
    const md = t.markdown();
    for (const g of TABLE_GROUPS) expect(md.split(`**${g}**`).length - 1, g).toBe(1);
    // no output id as a quantity's name, no doubled names
    expect(md).not.toMatch(/`width`|neelThresholdThinFilm|\| Inputs \|/);
    expect(md).toContain("| wall width parameter sqrt(A / K_eff) | $\\Delta$ | 5.841 nm |");
    expect(t.text()).toMatch(/^Results\n {2}Δ {2,}5\.841 nm {2,}wall width parameter/m);
  });

  it("puts statements in words under the table and arrays on one line", () => {
    const g = groupedRows(r);
    expect(g.statements.map((s) => s.name)).toEqual(["wallType", "regime"]);
    expect(g.rows.some((x) => x.name === "wallType")).toBe(false);
    const mz = g.rows.find((x) => x.name === "mz")!;
    expect(mz.value).toBe("161 values, -1 to 1");
    expect(t.html()).toContain('<tr class="helicoid-group"><th colspan="3" style="text-align:left">Inputs</th></tr>');
    expect(t.html()).toMatch(/<li><b>Regime|<li><b>What the film does/);
  });

  it("shows a choice input by its label", () => {
    const t2 = table(runCalculator(getCalculator("texture"), { kind: "antiskyrmion", n: 32 }));
    expect(t2.rows.find((x) => x.name === "kind")!.value).toBe("antiskyrmion");
  });

  it("writes symbols as Unicode text with sub- and superscripts", () => {
    expect(symbolPlain("\\mu_0 H")).toBe("μ₀ H");
    expect(symbolPlain("D_N^{(0)}")).toBe("D_N⁽⁰⁾");
    expect(symbolPlain("K_{eff}")).toBe("K_{eff}");
    expect(symbolPlain("M_s")).toBe("Mₛ");
    // the HTML table: every Greek letter of the catalogue, \\varphi included (was shown as "varphi")
    expect(symbolHtml("\\varphi_B")).toBe("<i>φ<sub>B</sub></i>");
  });

  it("helicoid calc prints the same groups, marks inputs left at their default", async () => {
    let out = "";
    const code = await calcCommand(["wall360", "Ms=1.1MA/m", "A=15pJ/m", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm"], {
      stdout: (s) => {
        out += s;
      },
      stderr: () => {},
    });
    expect(code).toBe(0);
    const lines = out.split("\n");
    expect(lines.filter((l) => /^(Inputs|Results|Other results)$/.test(l))).toEqual(["Inputs", "Results", "Other results"]);
    expect(out).toMatch(/^ {2}μ₀ H +50 mT +applied field .* \(default\)$/m);
    expect(out).not.toMatch(/^ {2}(in|out) /m);
  });
});

#!/usr/bin/env node
// `npm run bench`: runs every test/bench/*.bench.mjs (each exports `default async () => rows`),
// prints one table of side-by-side figures and writes test-output/bench.json.
// A row: { group, name, ours_ms, reference?, reference_ms?, ratio?, goal }.
// Benchmarks report; they never fail on a time (timing belongs here, not in tests).
import { readdirSync, mkdirSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith(".bench.mjs"))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();
const rows = [];
for (const f of files) {
  process.stderr.write(`bench: ${f}\n`);
  try {
    const mod = await import(pathToFileURL(join(here, f)).href);
    for (const r of await mod.default()) rows.push({ file: f, ...r });
  } catch (err) {
    rows.push({ file: f, group: f, name: "(failed)", error: String((err && err.stack) || err) });
  }
}
const fmt = (v) => (v === undefined ? "" : typeof v === "number" ? (Math.abs(v) >= 100 ? v.toFixed(0) : v.toPrecision(3)) : String(v));
/**
 * Every goal gets a verdict. A row that judged itself says "MET: ..." or "MISSED: ..."; otherwise
 * each clause of its goal of the form "[median|ratio] (<|<=) N [ms]" is judged on the row's ratio
 * (clauses naming the ratio) or its own median (ours_ms); a goal without a number ("one-time cost")
 * is marked informational.
 */
function verdictOf(r) {
  const goal = r.goal ?? "";
  if (/^(MET|MISSED)\b/.test(goal)) return goal.split(":")[0];
  const out = [];
  for (const clause of goal.split(",")) {
    const m = /(ratio)?[^<]*?(<=|<)\s*([0-9.]+(?:e-?[0-9]+)?)\s*(ms)?/.exec(clause);
    if (!m) continue;
    const value = m[1] ? r.ratio : r.ours_ms;
    if (typeof value !== "number") continue;
    const limit = Number(m[3]);
    const met = m[2] === "<" ? value < limit : value <= limit;
    out.push(`${met ? "MET" : "MISSED"} (${clause.trim()})`);
  }
  return out.length ? out.join("; ") : "informational";
}
for (const r of rows) if (!r.error) r.verdict = verdictOf(r);

// spread: a row may give ours_spread / reference_spread as [min, max] of its runs
const spread = (v) => (Array.isArray(v) ? ` [${fmt(v[0])}-${fmt(v[1])}]` : "");
console.log(["group", "name", "ours (ms) [min-max]", "reference", "reference (ms) [min-max]", "ratio", "goal", "verdict"].join(" | "));
for (const r of rows) {
  if (r.error) {
    console.log(`${r.group} | FAILED | ${r.error.split("\n")[0]}`);
    continue;
  }
  console.log(
    [r.group, r.name, fmt(r.ours_ms) + spread(r.ours_spread), r.reference ?? "", fmt(r.reference_ms) + spread(r.reference_spread), fmt(r.ratio), r.goal ?? "", r.verdict].join(
      " | ",
    ),
  );
}
const out = join(here, "..", "..", "test-output");
mkdirSync(out, { recursive: true });
writeFileSync(join(out, "bench.json"), JSON.stringify(rows, null, 2));

// Development aid: a CPU profile (CDP Profiler) of an exported page's load until the first drawn
// explorer plot; prints self time by function and by script region.
// `node test/bench/pageProfile.mjs PAGE.html [out.cpuprofile]`
import { writeFileSync } from "node:fs";
import { launch } from "./pageProbe.mjs";

const [file, out] = process.argv.slice(2);
const browser = await launch();
try {
  const context = await browser.newContext({ viewport: { width: 1200, height: 900 } });
  const page = await context.newPage();
  const cdp = await context.newCDPSession(page);
  await cdp.send("Profiler.enable");
  await cdp.send("Profiler.setSamplingInterval", { interval: 200 });
  await cdp.send("Profiler.start");
  await page.goto(`file://${file}`, { waitUntil: "commit" });
  await page.waitForSelector(".hx-explorer .hx-plot svg.main-svg", { timeout: 120_000 });
  const ms = await page.evaluate(() => performance.now());
  const { profile } = await cdp.send("Profiler.stop");
  if (out) writeFileSync(out, JSON.stringify(profile));
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const self = new Map();
  const dt = profile.timeDeltas;
  profile.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (dt[i] ?? 0) / 1000));
  const agg = new Map();
  for (const [id, t] of self) {
    const n = byId.get(id);
    const f = n.callFrame;
    const key = `${f.functionName || "(anon)"} ${f.url ? "L" + f.lineNumber + ":" + f.columnNumber : ""}`;
    agg.set(key, (agg.get(key) ?? 0) + t);
  }
  console.log(`drawn at ${ms.toFixed(0)} ms`);
  for (const [k, t] of [...agg].sort((a, b) => b[1] - a[1]).slice(0, 40)) console.log(t.toFixed(1).padStart(8), k);
  await context.close();
} finally {
  await browser.close();
}

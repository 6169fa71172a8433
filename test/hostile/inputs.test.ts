/**
 * Hostile inputs to the file commands (issue 11): large and lying files end in a result or in exit
 * 2 with one line and the memory estimate; fit CSVs name the file line of a bad cell; options are
 * parsed strictly; long echoed values are shortened; --json to a pipe is complete; the gallery
 * server answers malformed percent-encodings with 400 and keeps serving. Spawns the built command.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { closeSync, ftruncateSync, mkdtempSync, openSync, readFileSync, rmSync, statSync, writeFileSync, writeSync } from "node:fs";
import { connect } from "node:net";
import type { Server } from "node:http";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin, repoRoot } from "../helpers/paths.js";
import { runPython } from "../helpers/python.js";
import { skyrmionLatticeTexture } from "../../lib/src/topology/textures.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-hostile-inputs-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const sha = (f: string) => createHash("sha256").update(readFileSync(f)).digest("hex");
const helicoid = (args: string[], cwd = dir) => spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8", cwd, timeout: 120_000, maxBuffer: 1 << 26 });
const lines = (s: string) => s.trim().split("\n");

/** A .npy v1.0 header for `descr` and `shape`, padded to 64 bytes as numpy does. */
function npyHeader(descr: string, shape: number[], fortran = false): Buffer {
  let d = `{'descr': '${descr}', 'fortran_order': ${fortran ? "True" : "False"}, 'shape': (${shape.join(", ")}), }`;
  d += " ".repeat((64 - ((10 + d.length + 1) % 64)) % 64) + "\n";
  const h = Buffer.alloc(10);
  Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0]).copy(h);
  h.writeUInt16LE(d.length, 8);
  return Buffer.concat([h, Buffer.from(d, "latin1")]);
}

/** A sparse file: `head` then zeros up to `size` bytes (nothing written but the head). */
function sparse(name: string, head: Buffer, size: number): string {
  const path = join(dir, name);
  const fd = openSync(path, "w");
  writeSync(fd, head);
  ftruncateSync(fd, size);
  closeSync(fd);
  return path;
}

describe("large files end in a result or exit 2 with one line and the estimate", () => {
  it("a .npy over 2 GiB in big-endian float64 is refused from its header (no ERR_FS_FILE_TOO_LARGE)", () => {
    const h = npyHeader(">f8", [10000, 10000, 3], true);
    const f = sparse("huge.npy", h, h.length + 10000 * 10000 * 3 * 8);
    expect(statSync(f).size).toBeGreaterThan(2 ** 31);
    const r = helicoid(["charge", f]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(/huge\.npy: size = "10000 x 10000 x 1 cells".*needs about 4\.80 GB/)]);
  });

  it("a JSON field declaring nx = ny = 100000 is refused before anything is allocated", () => {
    const f = join(dir, "huge.json");
    writeFileSync(f, JSON.stringify({ kind: "helicoid-vector-field", version: 1, nx: 100000, ny: 100000, m: [] }));
    const r = helicoid(["charge", f]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(/huge\.json: size = "100000 x 100000 x 1 cells".*about 480 GB/)]);
  });

  it("a 1 GB CSV is streamed line by line: a file of zeros after its header is refused at its first long line, not a string-length crash", () => {
    const f = sparse("huge.csv", Buffer.from("x,y,mx,my,mz\n"), 1e9);
    const r = helicoid(["charge", f]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(/huge\.csv: line 2 = "a line longer than 1\.05 MB".*a table of short lines/)]);
  });

  it("a 1 GB JSON field is refused with the memory parsing it would need", () => {
    const f = sparse("huge-text.json", Buffer.from("{"), 1e9);
    const r = helicoid(["charge", f]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(/huge-text\.json: size = "1\.00 GB".*at most 256 MB.*\.npy/)]);
  });

  it("a streamed CSV table gives the same charge as the .npy of the same field", () => {
    // Source: Q = -1 per skyrmion of the generator's lattice (four in this box).
    const f = skyrmionLatticeTexture({ nx: 64, ny: 64, dx: 1e-9 }, { a: 32e-9, R: 7e-9, w: 2e-9 });
    const rows = ["x (nm)\ty (nm)\tmx\tmy\tmz"];
    for (let j = 0; j < 64; j++)
      for (let i = 0; i < 64; i++) {
        const c = 3 * (j * 64 + i);
        rows.push(`${i}\t${j}\t${f.m[c]}\t${f.m[c + 1]}\t${f.m[c + 2]}`);
      }
    const p = join(dir, "lattice.tsv");
    writeFileSync(p, rows.join("\r\n") + "\r\n");
    const r = helicoid(["charge", p, "--json", "--boundary", "periodic"]);
    expect(r.status).toBe(0);
    expect(Math.abs(JSON.parse(r.stdout).skyrmionNumber + 4)).toBeLessThan(1e-9);
  });

  it("a .npy in any byte order, width and memory order (written by numpy) gives the same charge, read in chunks", () => {
    // Source: Q = -1 per skyrmion of the generator's lattice (four in this box); numpy writes the files.
    const f = skyrmionLatticeTexture({ nx: 64, ny: 64, dx: 1e-9 }, { a: 32e-9, R: 7e-9, w: 2e-9 });
    const variants = [
      ["<f8", false],
      [">f8", true],
      [">f4", false],
      ["<f4", true],
    ] as const;
    const files = runPython<string[]>(
      `import json, sys, numpy as np
d = json.load(sys.stdin)
m = np.array(d["m"], dtype=float).reshape(64, 64, 3)
out = []
for descr, fortran in d["variants"]:
    p = d["dir"] + "/v-" + descr.replace("<", "le").replace(">", "be") + ("-F" if fortran else "-C") + ".npy"
    np.save(p, np.asarray(m, dtype=np.dtype(descr), order="F" if fortran else "C"))
    out.append(p)
print(json.dumps(out))`,
      { m: Array.from(f.m), variants, dir },
    );
    const q = files.map((p) => {
      const r = helicoid(["charge", p, "--json", "--boundary", "periodic"]);
      expect(r.status).toBe(0);
      return JSON.parse(r.stdout).skyrmionNumber as number;
    });
    for (const v of q) expect(Math.abs(v + 4)).toBeLessThan(1e-4);
    expect(Math.abs(q[0]! - q[1]!)).toBeLessThan(1e-12);
  });
});

describe("fit CSVs: the file line of a bad cell, decimal numbers only, clear answers", () => {
  const profile = (name: string, cell: (i: number) => string) => {
    const f = join(dir, name);
    let t = "x (nm),mz\n";
    for (let i = 0; i < 100; i++) t += `${i},${cell(i)}\n`;
    writeFileSync(f, t);
    return f;
  };
  it.each([
    ["Infinity", /line 52, column mz = "Infinity" is not valid: expected a decimal number/],
    ["1e999", /line 52, column mz = "1e999" is not valid: expected a finite number/],
    ["0x1", /line 52, column mz = "0x1" is not valid: expected a decimal number .*no hex/],
    ["0b1", /line 52, column mz = "0b1"/],
    ["0o7", /line 52, column mz = "0o7"/],
  ])("a cell %s is refused with its file line", (bad, message) => {
    const f = profile(`bad-${bad}.csv`, (i) => (i === 50 ? bad : String(Math.tanh((i - 50) / 5))));
    const before = sha(f);
    const r = helicoid(["fit", f, "--model", "wall180-mz"]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(message)]);
    expect(sha(f)).toBe(before);
  });

  it("all-equal positions get a clear message", () => {
    const f = join(dir, "equal.csv");
    writeFileSync(f, "x (nm),mz\n" + Array.from({ length: 20 }, (_, i) => `5,${i / 20}\n`).join(""));
    const r = helicoid(["fit", f, "--model", "wall180-mz"]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(/all x values are equal: a profile needs a range of positions/)]);
  });

  it("150,000 unsorted rows are sorted and fitted (no call-stack overflow)", () => {
    // Source: the data are m_z = -tanh((x - 75 nm)/5 nm) exactly, so the fit returns x0 = 75 nm, Delta = 5 nm.
    const n = 150_000;
    const order = Array.from({ length: n }, (_, i) => i);
    for (let i = n - 1; i > 0; i--) {
      const j = (i * 7919 + 13) % (i + 1);
      [order[i], order[j]] = [order[j]!, order[i]!];
    }
    const f = join(dir, "unsorted.csv");
    writeFileSync(f, "x (nm),mz\n" + order.map((k) => `${k / 1000},${-Math.tanh((k / 1000 - 75) / 5)}\n`).join(""));
    const r = helicoid(["fit", f, "--model", "wall180-mz", "--json"]);
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(Math.abs(j.parameters.x0.value - 75e-9)).toBeLessThan(1e-12);
    expect(Math.abs(j.parameters.Delta.value - 5e-9)).toBeLessThan(1e-12);
    expect(j.notes.join(" ")).toMatch(/positions were not sorted/);
  });

  it("a field CSV with x = 1e999 blames that row, and hex numbers are refused", () => {
    const rows = ["x,y,mx,my,mz"];
    for (let j = 0; j < 4; j++) for (let i = 0; i < 4; i++) rows.push(`${i === 2 && j === 1 ? "1e999" : i},${j},0,0,1`);
    const f = join(dir, "field.csv");
    writeFileSync(f, rows.join("\n") + "\n");
    const r = helicoid(["charge", f]);
    expect(r.status).toBe(2);
    expect(lines(r.stderr)).toEqual([expect.stringMatching(/field\.csv: row 8, column 1 \(x\) = "1e999".*finite number/)]);
    writeFileSync(f, rows.join("\n").replace("1e999", "0x2") + "\n");
    const r2 = helicoid(["charge", f]);
    expect(r2.status).toBe(2);
    expect(r2.stderr).toMatch(/row 8, column 1 \(x\) = "0x2"/);
  });
});

describe("strict options and short messages", () => {
  it.each([
    [["fit", "p.csv", "--model", "wall180-mz", "--model", "wall360-mz"], /--model given twice \(wall180-mz, wall360-mz\): give it once/],
    [["fit", "p.csv", "-m", "wall180-mz", "--model", "wall360-mz"], /--model given twice/],
    [["fit", "--series", "a.csv@5mT", "--film", "Ms=1MA/m", "--film", "Ms=2MA/m"], /--film given twice/],
    [["export", "a.ipynb", "-o", "a.html", "-o", "b.html"], /-o given twice \(a\.html, b\.html\)/],
    [["export", "a.ipynb", "--title", "x", "--title", "y"], /--title given twice/],
    [["install", "--prefix", "/tmp/a", "--prefix", "/tmp/b"], /--prefix given twice/],
    [["run", "a.ipynb", "--timeout", "5", "--timeout", "6"], /--timeout given twice/],
  ])("%j is refused (exit 2)", (args, message) => {
    const r = helicoid(args as string[]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(message as RegExp);
  });

  it("a 100,000-character value is echoed as its first 80 and last 20 characters with the length", () => {
    const long = "q".repeat(100_000);
    const r = helicoid(["fit", "p.csv", "--model", long]);
    expect(r.status).toBe(2);
    expect(r.stderr.length).toBeLessThan(1000);
    expect(r.stderr).toMatch(/"q{79}…q{19}" \(100002 characters\)/);
  });
});

describe("whole answers", () => {
  it("--json to a pipe that is read late is complete (166 kB, not cut at 65,536 bytes)", () => {
    const r = spawnSync("/bin/sh", ["-c", `"${process.execPath}" "${helicoidBin}" calc wall-fit R=90nm w=2nm points=2000 --json | (sleep 2; cat)`], {
      encoding: "utf8",
      maxBuffer: 1 << 26,
      timeout: 120_000,
    });
    expect(r.stdout.length).toBeGreaterThan(65_536);
    expect(() => JSON.parse(r.stdout)).not.toThrow();
  });

  it("export of a notebook with a null output gives a page and no stack trace; a link to the input is refused", () => {
    const nb = join(dir, "null.ipynb");
    writeFileSync(
      nb,
      JSON.stringify({ nbformat: 4, nbformat_minor: 5, metadata: {}, cells: [{ cell_type: "code", source: "1", metadata: {}, outputs: [null], execution_count: 1 }, null] }),
    );
    const before = sha(nb);
    const r = helicoid(["export", nb, "-o", join(dir, "null.html")]);
    expect(r.status).toBe(0);
    expect(readFileSync(join(dir, "null.html"), "utf8")).toMatch(/an output that is not an object: null; skipped/);
    spawnSync("ln", ["-f", nb, join(dir, "null-hard.ipynb")]);
    spawnSync("ln", ["-sf", nb, join(dir, "null-soft.ipynb")]);
    for (const o of ["null-hard.ipynb", "null-soft.ipynb"]) {
      const r2 = helicoid(["export", nb, "-o", join(dir, o)]);
      expect(r2.status).toBe(2);
      expect(lines(r2.stderr)).toEqual([expect.stringMatching(/is the notebook itself \(the same file, or a link to it\)/)]);
    }
    expect(sha(nb)).toBe(before);
  });
});

describe("the gallery server", () => {
  let server: Server;
  let port: number;
  beforeAll(async () => {
    writeFileSync(join(dir, "index.html"), "<p>gallery</p>");
    // The built server of `helicoid start`, on 127.0.0.1 and a free port.
    const { serveDirectory } = (await import(join(repoRoot, "kernel-ext", "dist", "cli", "start.js"))) as { serveDirectory: (d: string, p: number) => Promise<Server> };
    server = await serveDirectory(dir, 0);
    port = (server.address() as { port: number }).port;
  });
  afterAll(() => new Promise<void>((r) => server.close(() => r())));

  const raw = (path: string) =>
    new Promise<string>((res, rej) => {
      const s = connect(port, "127.0.0.1", () => s.write(`GET ${path} HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n`));
      let data = "";
      s.on("data", (d) => (data += d));
      s.on("end", () => res(data.split("\r\n")[0]!));
      s.on("error", rej);
    });

  it("answers /%, /%zz and /%ff with 400 and keeps serving", async () => {
    for (const p of ["/%", "/%zz", "/%ff", "/%E0%A4%A", "/a%00b"]) expect(await raw(p)).toBe("HTTP/1.1 400 Bad Request");
    expect(await raw("/")).toBe("HTTP/1.1 200 OK");
    expect(await raw("/../../etc/passwd")).toBe("HTTP/1.1 404 Not Found");
  });
});

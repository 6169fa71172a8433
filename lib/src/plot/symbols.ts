/**
 * The catalogue's symbols are written in a small LaTeX-like notation ("\\mu_0 H", "C_-^{Haldane}(M)",
 * "\\log_{10}(\\Delta/k_B\\,[K])"). Plotly draws only plain text with a few HTML tags (<sub>, <sup>,
 * <i>, <b>, <br>) and entities, so the symbols are converted here: Greek letters and operators to
 * Unicode, subscripts and superscripts to <sub>/<sup>, braces and backslashes removed. A command we
 * do not know keeps its name without the backslash. Common practice, no source.
 */

const NAMES: Record<string, string> = {
  alpha: "α",
  beta: "β",
  gamma: "γ",
  delta: "δ",
  epsilon: "ε",
  varepsilon: "ε",
  zeta: "ζ",
  eta: "η",
  theta: "θ",
  vartheta: "ϑ",
  iota: "ι",
  kappa: "κ",
  lambda: "λ",
  mu: "μ",
  nu: "ν",
  xi: "ξ",
  pi: "π",
  rho: "ρ",
  sigma: "σ",
  tau: "τ",
  upsilon: "υ",
  phi: "φ",
  varphi: "φ",
  chi: "χ",
  psi: "ψ",
  omega: "ω",
  Gamma: "Γ",
  Delta: "Δ",
  Theta: "Θ",
  Lambda: "Λ",
  Xi: "Ξ",
  Pi: "Π",
  Sigma: "Σ",
  Phi: "Φ",
  Psi: "Ψ",
  Omega: "Ω",
  langle: "⟨",
  rangle: "⟩",
  perp: "⊥",
  parallel: "∥",
  hbar: "ħ",
  infty: "∞",
  partial: "∂",
  nabla: "∇",
  sum: "∑",
  int: "∫",
  oint: "∮",
  pm: "±",
  mp: "∓",
  times: "×",
  cdot: "·",
  approx: "≈",
  sim: "∼",
  le: "≤",
  leq: "≤",
  ge: "≥",
  geq: "≥",
  ne: "≠",
  neq: "≠",
  to: "→",
  rightarrow: "→",
  leftarrow: "←",
  circ: "∘",
  prime: "′",
  ell: "ℓ",
  degree: "°",
  AA: "Å",
  lvert: "|",
  rvert: "|",
  vert: "|",
  mid: "|",
  log: "log",
  ln: "ln",
  exp: "exp",
  sin: "sin",
  cos: "cos",
  tan: "tan",
  sinh: "sinh",
  cosh: "cosh",
  tanh: "tanh",
  arctan: "arctan",
  min: "min",
  max: "max",
  det: "det",
  Re: "Re",
  Im: "Im",
};
const OPERATORS = new Set(["log", "ln", "exp", "sin", "cos", "tan", "sinh", "cosh", "tanh", "arctan", "min", "max", "det", "Re", "Im"]);
/** Commands that take one argument and put a combining accent on it. */
const ACCENTS: Record<string, string> = { hat: "\u0302", bar: "\u0304", tilde: "\u0303", dot: "\u0307", vec: "\u20D7" };
/** Commands whose one argument is shown as it is (roman text). */
const PLAIN = new Set(["mathrm", "text", "textrm", "mathit", "operatorname", "mathbf", "boldsymbol", "rm"]);
const SPACES: Record<string, string> = { ",": "\u2009", ";": " ", ":": " ", " ": " ", "!": "", quad: " ", qquad: "  " };

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

class Reader {
  i = 0;
  constructor(readonly s: string) {}
  get done(): boolean {
    return this.i >= this.s.length;
  }
  peek(): string {
    return this.s[this.i] ?? "";
  }
}

/** One argument: a {group}, a \command, or one character (spaces before it skipped). */
function readArgument(r: Reader, inScript: boolean): string {
  while (r.peek() === " ") r.i++;
  if (r.done) return "";
  const c = r.peek();
  if (c === "{") {
    r.i++;
    const out = readSequence(r, "}", inScript);
    if (r.peek() === "}") r.i++;
    return out;
  }
  if (c === "\\") return readCommand(r, inScript);
  r.i++;
  return literal(c, inScript);
}

function literal(c: string, inScript: boolean): string {
  if (c === "-" && inScript) return "−";
  if (c === "~") return " ";
  return escapeHtml(c);
}

function readCommand(r: Reader, inScript: boolean): string {
  r.i++; // backslash
  const m = /^[A-Za-z]+/.exec(r.s.slice(r.i));
  if (!m) {
    const c = r.peek();
    r.i++;
    if (c in SPACES) return SPACES[c]!;
    return escapeHtml(c); // \{ \} \% \_ ...
  }
  const name = m[0];
  r.i += name.length;
  // spaces after a command name end the name (as in TeX); an operator keeps one before its argument
  const spaced = r.peek() === " ";
  while (r.peek() === " ") r.i++;
  if (OPERATORS.has(name) && spaced && /[\p{L}\p{N}\\]/u.test(r.peek())) return `${NAMES[name]} `;
  if (name in SPACES) return SPACES[name]!;
  if (name === "frac") {
    const a = readArgument(r, inScript),
      b = readArgument(r, inScript);
    const wrap = (t: string) => (/^[\p{L}\p{N}]+$/u.test(t.replace(/<\/?su[bp]>/g, "")) ? t : `(${t})`);
    return `${wrap(a)}/${wrap(b)}`;
  }
  if (name === "sqrt") return `√(${readArgument(r, inScript)})`;
  if (name in ACCENTS) {
    const arg = readArgument(r, inScript);
    // the accent goes on the first character of the argument (a symbol is one letter here)
    const chars = Array.from(arg);
    return chars.length ? chars[0] + ACCENTS[name]! + chars.slice(1).join("") : "";
  }
  if (PLAIN.has(name)) return readArgument(r, inScript);
  if (name === "left" || name === "right" || name === "big" || name === "Big" || name === "bigl" || name === "bigr") return "";
  if (!(name in NAMES)) return spaced && /[\p{L}\p{N}]/u.test(r.peek()) ? `${name} ` : name;
  return NAMES[name]!;
}

function readSequence(r: Reader, end: string, inScript: boolean): string {
  let out = "";
  while (!r.done) {
    const c = r.peek();
    if (end && c === end) break;
    if (c === "}") {
      r.i++;
      continue;
    } // stray closing brace: dropped
    if (c === "{") {
      r.i++;
      out += readSequence(r, "}", inScript);
      if (r.peek() === "}") r.i++;
      continue;
    }
    if (c === "_" || c === "^") {
      r.i++;
      const arg = readArgument(r, true);
      out += c === "_" ? `<sub>${arg}</sub>` : `<sup>${arg}</sup>`;
      continue;
    }
    if (c === "\\") {
      out += readCommand(r, inScript);
      continue;
    }
    r.i++;
    out += literal(c, inScript);
  }
  return out;
}

/** A catalogue symbol as plotly text (HTML subset): "\\mu_0 H" -> "μ<sub>0</sub> H". */
export function symbolHtml(symbol: string): string {
  return readSequence(new Reader(symbol), "", false).replace(/ {2,}/g, " ").trim();
}

/** The same as plain Unicode text without tags (for a tooltip or a file name). */
export function symbolText(symbol: string): string {
  return symbolHtml(symbol)
    .replace(/<\/?(sub|sup)>/g, "")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");
}

/**
 * A symbol with a trailing argument that is the x quantity removed ("R(B)" on a B axis -> "R"),
 * for a legend or an axis title beside an x axis that already says what it is a function of.
 */
export function withoutArgument(symbol: string, xSymbol: string): string {
  const m = /^(.+?)\(([^()]*)\)$/.exec(symbol.trim());
  if (!m) return symbol;
  const inner = m[2]!.trim();
  return inner === xSymbol.trim() || inner.replace(/\s+/g, "") === xSymbol.replace(/\s+/g, "") ? m[1]!.trim() : symbol;
}

/**
 * A small reader for the SPICE subcircuits the analysis exports: .SUBCKT/.ENDS, B sources with
 * I= expressions in SPICE3 syntax, and the parameter comment line. It evaluates the expressions
 * itself, so a test can compare the netlist's currents with the model's.
 */
export interface SpiceSubcircuit {
  name: string;
  nodes: string[];
  /** Parameters from the "* koren-... KEY=value" comment line. */
  params: Record<string, number>;
  kind: string;
  sources: {
    name: string;
    plus: string;
    minus: string;
    current: (v: Record<string, number>) => number;
  }[];
}

export function readSpiceSubcircuit(text: string): SpiceSubcircuit {
  const lines = text
    .split(/\r?\n/)
    .map((l) => l.trim())
    .filter((l) => l.length > 0);
  const sub = lines.find((l) => /^\.subckt\s/i.test(l));
  if (!sub) throw new Error('no .SUBCKT line');
  const [, name, ...nodes] = sub.split(/\s+/);
  const ends = lines.findIndex((l) => /^\.ends\b/i.test(l));
  if (ends < 0) throw new Error('no .ENDS line');
  const paramLine = lines.find((l) => /^\*\s*koren-(triode|pentode)\s/.test(l));
  if (!paramLine) throw new Error('no parameter comment');
  const kind = /koren-(\w+)/.exec(paramLine)![1];
  const params: Record<string, number> = {};
  for (const m of paramLine.matchAll(/(\w+)=([-+0-9.eE]+)/g))
    params[m[1].toLowerCase()] = Number(m[2]);
  const body = lines.slice(lines.indexOf(sub) + 1, ends).filter((l) => !l.startsWith('*'));
  const sources = body.map((l) => {
    const m = /^(B\w*)\s+(\w+)\s+(\w+)\s+I=(.+)$/i.exec(l);
    if (!m) throw new Error(`not a B current source: ${l}`);
    const expr = parseExpression(m[4]);
    return { name: m[1], plus: m[2], minus: m[3], current: (v: Record<string, number>) => expr(v) };
  });
  return { name, nodes, params, kind, sources };
}

type Node = (v: Record<string, number>) => number;

const FUNCTIONS: Record<string, (...a: number[]) => number> = {
  exp: Math.exp,
  ln: Math.log,
  sqrt: Math.sqrt,
  atan: Math.atan,
  abs: Math.abs,
  uramp: (x) => (x > 0 ? x : 0),
};

/** Recursive-descent parser for + - * / ^ **, unary minus, calls and V(a,b). */
function parseExpression(src: string): Node {
  const tokens =
    src.match(/\d+\.?\d*(?:[eE][-+]?\d+)?|\.\d+(?:[eE][-+]?\d+)?|\*\*|[A-Za-z_]\w*|[-+*/^(),]/g) ??
    [];
  if (tokens.join('') !== src.replace(/\s+/g, '')) throw new Error(`unreadable expression: ${src}`);
  let pos = 0;
  const peek = () => tokens[pos];
  const take = (t?: string) => {
    const tok = tokens[pos++];
    if (t !== undefined && tok !== t) throw new Error(`expected ${t}, got ${tok}`);
    return tok;
  };
  const primary = (): Node => {
    const tok = take();
    if (tok === '(') {
      const e = sum();
      take(')');
      return e;
    }
    if (tok === '-') {
      const e = power();
      return (v) => -e(v);
    }
    if (/^[\d.]/.test(tok)) {
      const x = Number(tok);
      return () => x;
    }
    if (/^v$/i.test(tok)) {
      take('(');
      const a = take();
      take(',');
      const b = take();
      take(')');
      return (v) => (v[a] ?? 0) - (v[b] ?? 0);
    }
    const f = FUNCTIONS[tok.toLowerCase()];
    if (!f) throw new Error(`unknown function ${tok}`);
    take('(');
    const args = [sum()];
    while (peek() === ',') {
      take(',');
      args.push(sum());
    }
    take(')');
    return (v) => f(...args.map((a) => a(v)));
  };
  const power = (): Node => {
    const base = primary();
    if (peek() === '^' || peek() === '**') {
      take();
      const exp = power();
      return (v) => base(v) ** exp(v);
    }
    return base;
  };
  const product = (): Node => {
    let left = power();
    while (peek() === '*' || peek() === '/') {
      const op = take();
      const right = power();
      const l = left;
      left = op === '*' ? (v) => l(v) * right(v) : (v) => l(v) / right(v);
    }
    return left;
  };
  const sum = (): Node => {
    let left = product();
    while (peek() === '+' || peek() === '-') {
      const op = take();
      const right = product();
      const l = left;
      left = op === '+' ? (v) => l(v) + right(v) : (v) => l(v) - right(v);
    }
    return left;
  };
  const e = sum();
  if (pos !== tokens.length) throw new Error(`trailing tokens in ${src}`);
  return e;
}

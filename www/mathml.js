// Shows our equation language in mathematical notation as MathML presentation markup.
//
// This parser is for display only: the solver's own parser (checkEquation in the wasm
// module) decides what is valid. Anything this one cannot read is shown as plain text.
// Nodes are built with createElementNS; no markup strings are ever parsed.

const NS = 'http://www.w3.org/1998/Math/MathML';

// ---- tokens and parser --------------------------------------------------------------

function tokenize(src) {
  const toks = [];
  let i = 0;
  while (i < src.length) {
    const c = src[i];
    if (c === ' ' || c === '\t' || c === '\r') { i++; continue; }
    if (c === '#') { while (i < src.length && src[i] !== '\n') i++; continue; }
    if (c === '\n' || c === ';') { toks.push({ t: 'sep', at: i }); i++; continue; }
    // The label SI: at the start of a statement (an empirical or SI-only statement).
    const label = /^SI[ \t]*:(?!=)/.exec(src.slice(i));
    if (label && (toks.length === 0 || toks[toks.length - 1].t === 'sep')) { toks.push({ t: 'label', v: 'SI', at: i }); i += label[0].length; continue; }
    // A number, with its unit in brackets if it has one: 9.80665[m/s^2].
    const num = /^(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?(?:[ \t]*\[([^\]\n;#]*)\])?/.exec(src.slice(i));
    if (num) { toks.push({ t: 'num', v: num[0].replace(/[ \t]*\[.*$/, ''), unit: num[3], at: i }); i += num[0].length; continue; }
    const id = /^[A-Za-z_][A-Za-z0-9_]*/.exec(src.slice(i));
    if (id) { toks.push({ t: 'id', v: id[0], at: i }); i += id[0].length; continue; }
    const two = src.slice(i, i + 2);
    if ([':=', '**', '<=', '>=', '==', '!='].includes(two)) { toks.push({ t: 'op', v: two === '**' ? '^' : two, at: i }); i += 2; continue; }
    const list = /^\{\s*([A-Za-z_][A-Za-z0-9_]*)\s*\}/.exec(src.slice(i));
    if (list) { toks.push({ t: 'list', v: list[1], at: i }); i += list[0].length; continue; }
    if ('+-*/^(),=<>%'.includes(c)) { toks.push({ t: 'op', v: c, at: i }); i++; continue; }
    throw new Error(`unexpected character "${c}" at ${i}`);
  }
  toks.push({ t: 'end', at: src.length });
  return toks;
}

/** Parses equation text into statements: {kind: 'eq'|'def'|'zero', lhs, rhs}. Throws on error. */
export function parseStatements(src) {
  const toks = tokenize(src);
  let p = 0;
  const peek = () => toks[p];
  const isOp = (v) => toks[p].t === 'op' && toks[p].v === v;
  const expect = (v) => {
    if (!isOp(v)) throw new Error(`expected "${v}" at ${toks[p].at}`);
    p++;
  };

  function primary() {
    const tk = peek();
    if (tk.t === 'num') { p++; return { t: 'num', v: tk.v, unit: tk.unit }; }
    if (tk.t === 'id') {
      p++;
      if (isOp('(')) {
        p++;
        const args = [];
        if (!isOp(')')) {
          args.push(expr());
          while (isOp(',')) { p++; args.push(expr()); }
        }
        expect(')');
        return { t: 'call', name: tk.v, args };
      }
      return { t: 'id', name: tk.v };
    }
    if (tk.t === 'list') { p++; return { t: 'list', name: tk.v }; }
    if (isOp('(')) { p++; const e = expr(); expect(')'); return { t: 'paren', a: e }; }
    throw new Error(`unexpected ${tk.t === 'end' ? 'end' : `"${tk.v ?? 'line end'}"`} at ${tk.at}`);
  }
  function power() {
    const base = primary();
    if (isOp('^')) { p++; return { t: 'bin', op: '^', a: base, b: unary() }; }
    return base;
  }
  function unary() {
    if (isOp('-')) { p++; return { t: 'neg', a: unary() }; }
    if (isOp('+')) { p++; return unary(); }
    return power();
  }
  function mul() {
    let a = unary();
    while (isOp('*') || isOp('/') || isOp('%')) { const op = peek().v; p++; a = { t: 'bin', op, a, b: unary() }; }
    return a;
  }
  function add() {
    let a = mul();
    while (isOp('+') || isOp('-')) { const op = peek().v; p++; a = { t: 'bin', op, a, b: mul() }; }
    return a;
  }
  function expr() {
    let a = add();
    while (['<', '>', '<=', '>=', '==', '!='].some(isOp)) { const op = peek().v; p++; a = { t: 'bin', op, a, b: add() }; }
    return a;
  }

  const out = [];
  while (peek().t !== 'end') {
    if (peek().t === 'sep') { p++; continue; }
    const label = peek().t === 'label' ? toks[p++].v : undefined;
    if (peek().t === 'id' && toks[p + 1].t === 'op' && toks[p + 1].v === ':=') {
      const name = peek().v;
      p += 2;
      out.push({ kind: 'def', lhs: { t: 'id', name }, rhs: expr(), label });
    } else {
      const lhs = expr();
      if (isOp('=')) { p++; out.push({ kind: 'eq', lhs, rhs: expr(), label }); }
      else out.push({ kind: 'zero', lhs, rhs: { t: 'num', v: '0' }, label });
    }
    if (peek().t !== 'sep' && peek().t !== 'end') throw new Error(`unexpected "${peek().v}" at ${peek().at}`);
  }
  return out;
}

// ---- MathML ------------------------------------------------------------------------

const GREEK = {
  alpha: 'α', beta: 'β', gamma: 'γ', delta: 'δ', epsilon: 'ε', eps: 'ε', zeta: 'ζ', eta: 'η',
  theta: 'θ', kappa: 'κ', lambda: 'λ', lam: 'λ', mu: 'μ', nu: 'ν', xi: 'ξ', rho: 'ρ', sigma: 'σ',
  tau: 'τ', phi: 'φ', chi: 'χ', psi: 'ψ', omega: 'ω', pi: 'π',
  Gamma: 'Γ', Delta: 'Δ', Theta: 'Θ', Lambda: 'Λ', Sigma: 'Σ', Phi: 'Φ', Psi: 'Ψ', Omega: 'Ω',
};

function m(tag, ...kids) {
  const el = document.createElementNS(NS, tag);
  for (const k of kids) el.append(typeof k === 'string' ? document.createTextNode(k) : k);
  return el;
}
const mo = (s) => m('mo', s);
const space = (width) => {
  const el = m('mspace');
  el.setAttribute('width', width);
  return el;
};
const mi = (s) => m('mi', s);

function ident(name) {
  const [base, ...sub] = name.split('_');
  const b = mi(GREEK[base] ?? base);
  if (base.length > 1 && !GREEK[base]) b.setAttribute('mathvariant', 'normal');
  if (sub.length === 0 || sub.join('') === '') return b;
  const s = sub.join(',');
  const subEl = mi(GREEK[s] ?? s);
  if (s.length > 1 && !GREEK[s]) subEl.setAttribute('mathvariant', 'normal');
  return m('msub', b, subEl);
}

function number(v) {
  const e = /^(.*?)[eE]([+-]?\d+)$/.exec(v);
  if (!e) return m('mn', v);
  const exp = e[2].replace(/^\+/, '').replace(/^-/, '\u2212');
  return m('mrow', m('mn', e[1]), mo('×'), m('msup', m('mn', '10'), m('mn', exp)));
}

function fenced(node) {
  return m('mrow', mo('('), node, mo(')'));
}

const PREC = { '<': 1, '>': 1, '<=': 1, '>=': 1, '==': 1, '!=': 1, '+': 2, '-': 2, '*': 3, '/': 3, '%': 3, neg: 4, '^': 5 };
function prec(n) {
  if (n.t === 'bin') return PREC[n.op];
  if (n.t === 'neg') return PREC.neg;
  if (n.t === 'num' && /[eE]/.test(n.v)) return PREC['*'];
  return 9;
}
const strip = (n) => (n.t === 'paren' ? strip(n.a) : n);

const OPS = { '*': '\u22c5', '-': '\u2212', '+': '+', '<=': '≤', '>=': '≥', '==': '=', '!=': '≠', '<': '<', '>': '>', '%': 'mod' };
const FN_NAMES = { ln: 'ln', log: 'log', exp: 'exp', sin: 'sin', cos: 'cos', tan: 'tan', asin: 'arcsin', acos: 'arccos', atan: 'arctan', sinh: 'sinh', cosh: 'cosh', tanh: 'tanh', sec: 'sec', csc: 'csc', cot: 'cot' };

function node(n, minPrec = 0) {
  n = strip(n);
  const out = build(n);
  return prec(n) < minPrec ? fenced(out) : out;
}

function build(n) {
  switch (n.t) {
    case 'num': return n.unit === undefined ? number(n.v) : m('mrow', number(n.v), space('0.17em'), m('mtext', n.unit.trim()));
    case 'id': return ident(n.name);
    case 'list': {
      // A list of values c0, c1, …, cn.
      const sub = (k) => m('msub', mi(GREEK[n.name] ?? n.name), k);
      return m('mrow', sub(m('mn', '0')), mo(','), sub(m('mn', '1')), mo(','), mo('…'), mo(','), sub(mi('n')));
    }
    case 'neg': return m('mrow', mo('\u2212'), node(n.a, PREC.neg));
    case 'call': return call(n);
    case 'bin': {
      const { op } = n;
      if (op === '/') return m('mfrac', node(n.a), node(n.b));
      if (op === '^') {
        const a = strip(n.a);
        // sqrt(x)^2 and f(x)^2 read better with the call fenced.
        const base = a.t === 'id' || a.t === 'num' && !/[eE]/.test(a.v) ? build(a) : fenced(build(a));
        return m('msup', base, node(n.b));
      }
      const p = PREC[op];
      const right = op === '-' || op === '*' || op === '%' ? p + 1 : p;
      return m('mrow', node(n.a, p), mo(OPS[op] ?? op), node(n.b, right));
    }
    default: throw new Error(`cannot show node ${n.t}`);
  }
}

function call(n) {
  const { name, args } = n;
  if (name === 'sqrt' && args.length === 1) return m('msqrt', node(args[0]));
  if (name === 'cbrt' && args.length === 1) return m('mroot', node(args[0]), m('mn', '3'));
  if (name === 'abs' && args.length === 1) return m('mrow', mo('|'), node(args[0]), mo('|'));
  if (name === 'log10' && args.length === 1) return m('mrow', m('msub', mi('log'), m('mn', '10')), mo('\u2061'), fenced(node(args[0])));
  if (name === 'exp' && args.length === 1 && prec(strip(args[0])) >= PREC['*'] && !isLong(args[0])) {
    return m('msup', mi('e'), node(args[0]));
  }
  if (name === 'when' && args.length === 3) {
    // when(t, a, b) = a if t > 0 else b
    const row = (val, cond) => m('mtr', m('mtd', val), m('mtd', cond));
    const table = m('mtable', row(node(args[1]), m('mrow', mi('if'), mo(' '), node(args[0]), mo('>'), m('mn', '0'))), row(node(args[2]), mi('otherwise')));
    table.setAttribute('columnalign', 'left');
    return m('mrow', mo('{'), table);
  }
  const f = mi(FN_NAMES[name] ?? name);
  if (!FN_NAMES[name] && name.length > 1) f.setAttribute('mathvariant', 'normal');
  const inner = m('mrow');
  args.forEach((a, i) => {
    if (i > 0) inner.append(mo(','));
    inner.append(node(a));
  });
  return m('mrow', f, mo('\u2061'), fenced(inner));
}

function isLong(n) {
  let count = 0;
  const walk = (x) => {
    count++;
    if (x.a) walk(x.a);
    if (x.b) walk(x.b);
    if (x.args) x.args.forEach(walk);
  };
  walk(n);
  return count > 5;
}

/** One <math display="block"> element per statement. Throws if the text cannot be read. */
export function equationToMathML(src) {
  return parseStatements(src).map((st) => {
    const row = m('mrow', node(st.lhs), mo(st.kind === 'def' ? '≔' : '='), node(st.rhs));
    // An SI-only statement says so after it, as a note.
    if (st.label === 'SI') row.append(space('1em'), m('mtext', '(SI units)'));
    const math = m('math', row);
    math.setAttribute('display', 'block');
    return math;
  });
}

/** A variable name as inline MathML (eps_D shows as ε with subscript D). */
export function symbolMathML(name) {
  const math = m('math', ident(name));
  return math;
}

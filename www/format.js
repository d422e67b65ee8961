// Number formatting for the page and the record.

const MINUS = '\u2212';

/** A number with `digits` significant digits, exponent form for very large or small values. */
export function fmt(x, digits = 6) {
  if (x === null || x === undefined) return '—';
  if (typeof x !== 'number') return String(x);
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : `${MINUS}∞`;
  if (x === 0) return '0';
  const a = Math.abs(x);
  let s;
  if (a >= 1e-4 && a < 1e7) {
    s = x.toPrecision(digits);
    if (s.includes('.') && !s.includes('e')) s = s.replace(/0+$/, '').replace(/\.$/, '');
  } else {
    s = x.toExponential(digits - 1).replace(/\.?0+e/, 'e');
    s = s.replace('e+', '×10^').replace('e-', `×10^${MINUS}`);
    const [m, e] = s.split('×10^');
    s = `${m}×10${superscript(e)}`;
  }
  return s.replace(/^-/, MINUS);
}

/** Full precision, for values a user may copy (shortest round-trip form). */
export function full(x) {
  if (typeof x !== 'number') return String(x);
  if (Number.isNaN(x)) return 'NaN';
  if (!Number.isFinite(x)) return x > 0 ? 'Infinity' : '-Infinity';
  return String(x);
}

const SUP = { '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', [MINUS]: '⁻', '-': '⁻' };
function superscript(s) {
  return [...s].map((c) => SUP[c] ?? c).join('');
}

/** Parses a number typed by a person: accepts 1e-4, 1.5E3, leading +, spaces; not "" or "1,5". */
export function parseNumber(text) {
  const t = String(text).trim().replace(/\u2212/g, '-');
  if (t === '') return { empty: true };
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return { error: `"${String(text).slice(0, 40)}" is not a number` };
  const v = Number(t);
  if (!Number.isFinite(v)) return { error: `"${String(text).slice(0, 40)}" is too large` };
  return { value: v };
}

/** A unit as people write it: kJ/(kg·K), m², s/m^(1/3). The unit's code stays as it is. */
export function prettyUnit(u) {
  if (!u || u === '1') return '';
  return String(u).replace(/\*/g, '·').replace(/\^2(?![\d.])/g, '²').replace(/\^3(?![\d.])/g, '³');
}

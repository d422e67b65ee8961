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
    // Rounded to `digits` significant digits and written out in full (toPrecision alone
    // would write 250000 to 4 digits as 2.500e+5).
    s = String(Number(x.toPrecision(digits)));
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

/** A unit as people write it: kJ/(kg·K), m², cm³/mol, µm, s/m^(1/3). The unit's code
 *  (what the solver reads) stays as it is; this is only how it is shown. */
export function prettyUnit(u) {
  if (!u || u === '1') return '';
  let s = String(u);
  // Prefix micro written as "u" (um, uA, …) and the ohm written out.
  s = s.replace(/(^|[^A-Za-z])u(?=[A-Za-z])/g, '$1µ').replace(/([kMm]?)ohm\b/g, '$1Ω');
  s = s.replace(/\bdeg([CF])\b/g, '°$1');
  s = s.replace(/\^(-?\d+)(?![\d.])/g, (_, e) => superscript(e.replace('-', MINUS)));
  return s.replace(/\*/g, '·');
}


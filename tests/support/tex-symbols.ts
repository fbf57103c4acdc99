/**
 * The symbols a KaTeX source writes, as families a checker reads: the letter (Latin, Greek or
 * bold) with its qualifying subscript, joint and member tags (\text{…}) written T and running
 * indices (digits, i, j, i±1) written i, so P_{\text{L0},y} is "P_{T,y}", L_{i+1} and L_{2} are
 * "L_{i}", c_{\mathrm{exact}} is "c_{exact}". Units (\mathrm{…} outside a subscript), words
 * (\text{…}), numbers, function names and spacing are not symbols. Test support, no source.
 */

const SKIP = new Set([
  'frac', 'tfrac', 'dfrac', 'left', 'right', 'quad', 'qquad', 'cos', 'sin', 'tan', 'arctan', 'times', 'cdot', 'allowbreak',
  'begin', 'end', 'displaystyle', 'Rightarrow', 'to', 'le', 'ge', 'leq', 'geq', 'approx', 'ne', 'pm', 'mp', 'circ', 'dots', 'ldots',
  'cdots', 'vdots', 'ddots', 'max', 'min', 'sqrt', 'big', 'Big', 'bigl', 'bigr', 'mid', 'vert', 'lvert', 'rvert', 'lVert', 'rVert',
  'text', 'mathrm', 'operatorname', 'hline', 'phantom', 'enspace', 'thinspace', 'lbrace', 'rbrace', 'langle', 'rangle', 'overline',
  'underbrace', 'overbrace', 'limits', 'implies', 'iff', 'checkmark', 'boxed', 'color', 'textcolor', 'hspace', 'vspace', 'kern',
  'mathbf', 'boldsymbol', 'bm', 'infty', 'leftarrow', 'rightarrow', 'uparrow', 'downarrow', 'Leftarrow', 'sum', 'prod', 'log', 'ln', 'exp', 'det',
]);
const GREEK = new Set([
  'alpha', 'beta', 'gamma', 'delta', 'epsilon', 'varepsilon', 'zeta', 'eta', 'theta', 'vartheta', 'iota', 'kappa', 'lambda', 'mu', 'nu', 'xi',
  'pi', 'rho', 'sigma', 'tau', 'upsilon', 'phi', 'varphi', 'chi', 'psi', 'omega', 'Gamma', 'Delta', 'Theta', 'Lambda', 'Xi', 'Pi', 'Sigma',
  'Upsilon', 'Phi', 'Psi', 'Omega',
]);

/** The group in braces starting at `i` (at "{"), and the index after it. */
function group(src: string, i: number): [string, number] {
  let depth = 0;
  for (let k = i; k < src.length; k++) {
    if (src[k] === '\\') {
      k++;
      continue;
    }
    if (src[k] === '{') depth++;
    else if (src[k] === '}' && --depth === 0) return [src.slice(i + 1, k), k + 1];
  }
  return [src.slice(i + 1), src.length];
}

/** A sub- or superscript argument at `i` (after "_" or "^"): a group, a command or one character. */
function argument(src: string, i: number): [string, number] {
  while (src[i] === ' ') i++;
  if (src[i] === '{') return group(src, i);
  if (src[i] === '\\') {
    const m = /^\\([a-zA-Z]+)/.exec(src.slice(i));
    if (m) return [m[0], i + m[0].length];
  }
  return [src[i] ?? '', i + 1];
}

/** A subscript as a checker reads it: tags T, indices i, qualifiers as written. */
function subscriptKey(sub: string): string {
  const parts: string[] = [];
  let rest = sub.replace(/\\text\{[^{}]*\}/g, 'T').replace(/\\mathrm\{([^{}]*)\}/g, '$1').replace(/\\,|\\ |\s/g, '');
  rest = rest.replace(/\\([a-zA-Z]+)/g, '$1');
  for (const p of rest.split(',')) {
    if (/^(\d+|[ij]([+-]\d+)?)$/.test(p)) parts.push('i');
    else if (p) parts.push(p);
  }
  return parts.join(',');
}

/** The symbol families a KaTeX source writes. */
export function texSymbols(source: string): Set<string> {
  const out = new Set<string>();
  const src = source;
  let i = 0;
  const take = (base: string, at: number) => {
    let k = at;
    let sub = '';
    let sup = '';
    for (let turn = 0; turn < 2; turn++) {
      while (src[k] === ' ') k++;
      if (src[k] === '_' && !sub) [sub, k] = argument(src, k + 1);
      else if (src[k] === '^' && !sup) [sup, k] = argument(src, k + 1);
    }
    const key = sub ? subscriptKey(sub) : '';
    out.add(key ? `${base}_{${key}}` : base);
    // A superscript may hold symbols of its own (not the degree sign or a power).
    if (sup && !/^\\circ$|^\d+$/.test(sup)) for (const s of texSymbols(sup)) out.add(s);
    return k;
  };
  while (i < src.length) {
    const ch = src[i];
    if (ch === '\\') {
      const m = /^\\([a-zA-Z]+)/.exec(src.slice(i));
      if (!m) {
        i += 2; // \, \  \\ \% \& …
        continue;
      }
      const name = m[1];
      i += m[0].length;
      if (name === 'text' || name === 'mathrm' || name === 'operatorname' || name === 'begin' || name === 'end' || name === 'color' || name === 'hspace' || name === 'kern') {
        while (src[i] === ' ') i++;
        if (src[i] === '{') i = group(src, i)[1];
        continue;
      }
      if (name === 'mathbf' || name === 'boldsymbol' || name === 'bm') {
        while (src[i] === ' ') i++;
        const [inner, next] = src[i] === '{' ? group(src, i) : [src[i] ?? '', i + 1];
        i = take(`\\mathbf{${inner}}`, next);
        continue;
      }
      if (GREEK.has(name)) {
        i = take(`\\${name}`, i);
        continue;
      }
      if (SKIP.has(name)) continue;
      out.add(`\\${name}?`);
      continue;
    }
    // A number, also in e-notation (1.78e-14): not a symbol.
    const number = /^\d+(?:\.\d+)?(?:e[-+]?\d+)?/.exec(src.slice(i));
    if (number) {
      i += number[0].length;
      continue;
    }
    if (/[A-Za-z]/.test(ch)) {
      i = take(ch, i + 1);
      continue;
    }
    if (ch === '_' || ch === '^') {
      // A script on a group or number (…)^2: read past it.
      i = argument(src, i + 1)[1];
      continue;
    }
    i++;
  }
  return out;
}

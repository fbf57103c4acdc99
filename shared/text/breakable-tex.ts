/**
 * Adds the line breaks KaTeX does not find by itself: after each ",\ " of a list (a load
 * vector, a list of unknowns), and between the words of a \text{…} run (the paragraph that
 * introduces a simultaneous solve), each as \allowbreak. The printed source in `tex` stays as the
 * solver wrote it; only the typesetting changes.
 */
export function breakableTex(source: string): string {
  let out = '';
  let i = 0;
  while (i < source.length) {
    if (source.startsWith(',\\ ', i)) {
      out += ',\\allowbreak\\ ';
      i += 3;
      continue;
    }
    if (source.startsWith('\\text{', i)) {
      // The group's end at brace depth 0, skipping escaped braces.
      let depth = 1;
      let j = i + 6;
      let body = '';
      while (j < source.length && depth > 0) {
        const ch = source[j];
        if (ch === '\\' && j + 1 < source.length) {
          body += ch + source[j + 1];
          j += 2;
          continue;
        }
        if (ch === '{') depth++;
        else if (ch === '}') depth--;
        if (depth > 0) body += ch;
        j++;
      }
      out += `\\text{${splitTextWords(body)}}`;
      i = j;
      continue;
    }
    out += source[i];
    i++;
  }
  return out;
}

/** The body of a \text{…} with a break allowed at each plain space outside inner braces. */
function splitTextWords(body: string): string {
  let out = '';
  let depth = 0;
  for (let k = 0; k < body.length; k++) {
    const ch = body[k];
    if (ch === '\\' && k + 1 < body.length) {
      out += ch + body[k + 1];
      k++;
      continue;
    }
    if (ch === '{') depth++;
    else if (ch === '}') depth--;
    out += ch === ' ' && depth === 0 ? ' }\\allowbreak\\text{' : ch;
  }
  return out;
}

/**
 * The rows of an `aligned` block as equations of their own (the alignment marks `&` dropped), so
 * each row wraps at its relations and operators like any other equation: KaTeX never breaks a
 * line inside an environment, so one long row (the three-moment equation of a purlin) ran off
 * the page. A source that is not one `aligned` block is its one row.
 */
export function alignedRows(source: string): string[] {
  const m = /^\s*\\begin\{aligned\}([\s\S]*)\\end\{aligned\}\s*$/.exec(source);
  if (!m) return [source];
  const rows: string[] = [];
  let depth = 0;
  let env = 0;
  let row = '';
  const body = m[1];
  for (let i = 0; i < body.length; i++) {
    if (body.startsWith('\\begin{', i)) env++;
    if (body.startsWith('\\end{', i)) env--;
    const ch = body[i];
    if (ch === '\\' && body[i + 1] === '\\' && depth === 0 && env === 0) {
      rows.push(row);
      row = '';
      i++;
      continue;
    }
    if (ch === '\\' && i + 1 < body.length) {
      row += ch + body[i + 1];
      i++;
      continue;
    }
    if (ch === '{') depth++;
    else if (ch === '}') depth--;
    row += ch === '&' && depth === 0 && env === 0 ? '' : ch;
  }
  rows.push(row);
  return rows.map((r) => r.trim()).filter(Boolean);
}

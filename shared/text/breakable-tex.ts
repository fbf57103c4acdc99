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

import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { breakableTex } from './breakable-tex';

// KaTeX breaks inline maths only between its top-level "base" boxes (KaTeX docs, "Line breaks"):
// each \allowbreak starts a new one. Counting them in KaTeX's own output checks where a line may break.
const bases = (tex: string) => (katex.renderToString(`\\displaystyle ${tex}`, { displayMode: false }).match(/class="base"/g) ?? []).length;

describe('breakable KaTeX source', () => {
  it('when a load vector of 12 entries is typeset, then it may break after each comma, and reads the same', () => {
    const tex = `\\mathbf{P} = [${Array.from({ length: 12 }, (_, i) => `${-i}.700`).join(',\\ ')}]^{T}\\ \\mathrm{kN}`;
    expect(bases(tex)).toBeLessThanOrEqual(2);
    expect(bases(breakableTex(tex))).toBeGreaterThanOrEqual(12);
    expect(breakableTex(tex).replace(/\\allowbreak/g, '')).toBe(tex);
  });

  it('when a sentence in \\text{} is typeset, then it may break between words; braces and escapes inside stay whole', () => {
    const tex = '\\text{No joint is left with two or fewer unknown forces \\{here\\} so {the rest} are solved together}';
    const out = breakableTex(tex);
    expect(bases(out)).toBeGreaterThan(10);
    expect(out).toContain('\\text{\\{here\\} }');
    expect(out).toContain('{the rest}');
    // Rendered text is the same words in the same order.
    const words = (s: string) => katex.renderToString(s, { output: 'mathml' }).replace(/<annotation[\s\S]*<\/annotation>/, '').replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ').trim();
    expect(words(out).replace(/ /g, '')).toBe(words(tex).replace(/ /g, ''));
  });
});

import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { alignedRows, breakableTex } from './breakable-tex';

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

describe('alignedRows', () => {
  // Common practice, no source: an aligned block's rows are separated by \\ and aligned at &.
  it('when a source is one aligned block, then each row is an equation of its own without its alignment marks; braces and escaped signs stay', () => {
    const src = ['\\begin{aligned}', 'b_{s,\\text{L0}} &= \\tfrac{1}{2}(2.236\\,\\mathrm{m}) \\\\', '&R = c\\,w, \\quad \\text{(a \\& b)} \\\\', '&x = \\frac{1}{2}', '\\end{aligned}'].join('\n');
    expect(alignedRows(src)).toEqual(['b_{s,\\text{L0}} = \\tfrac{1}{2}(2.236\\,\\mathrm{m})', 'R = c\\,w, \\quad \\text{(a \\& b)}', 'x = \\frac{1}{2}']);
  });
  it('when a source is not an aligned block, then it is its one row', () => {
    expect(alignedRows('F = 1')).toEqual(['F = 1']);
  });
});

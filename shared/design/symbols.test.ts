import { describe, expect, it } from 'vitest';
import { DESIGN_STANDARDS, senseCheck, type MemberDesign } from './checks';
import { sectionProperties } from './sections';
import { designSymbols, undefinedIn } from './symbols';

/**
 * Every symbol a member-design step prints is in its design basis's symbol list (the sheet prints
 * that list on the member-design page before the first steps). The steps are produced by the
 * checks themselves, for both senses and for slendernesses on each side of the branches
 * (AISC E3 inelastic/elastic at 4.71√(E/Fy), EN λ̄ ≤ 0.2, NDS), so a new formula with a new
 * symbol fails here until the symbol is defined. Common practice, no source: the rule that a
 * calculation defines each symbol it uses.
 */
function stepFormulas(standard: (typeof DESIGN_STANDARDS)[number]): string[] {
  const out = new Set<string>();
  const material: MemberDesign['material'] = standard.startsWith('nds')
    ? { kind: 'timber', Ft: 5, Fc: 8, Emin: 4000, E: 9000, c: 0.8 }
    : { kind: 'steel', Fy: 345, Fu: 450, E: 200_000 };
  for (const sense of ['tension', 'compression'] as const) {
    for (const slender of [8, 50, 150]) {
      const d: MemberDesign = { material, section: sectionProperties({ shape: 'properties', A: 2000, rx: 50, ry: 100 }, 'M1'), Kx: 1, Ky: 1, Lx: slender * 50, Ly: slender * 50 };
      for (const s of senseCheck(standard, sense, d).steps) out.add(s.formula);
    }
  }
  return [...out];
}

describe('member-design symbols', () => {
  for (const standard of DESIGN_STANDARDS) {
    it(`${standard}: every symbol its steps print is defined in its list`, () => {
      const formulas = stepFormulas(standard);
      expect(formulas.length).toBeGreaterThan(5);
      const missing = formulas.flatMap((f) => undefinedIn(f, designSymbols(standard)).map((t) => `${t} in "${f}"`));
      expect(missing).toEqual([]);
    });
  }

  it('the check finds a symbol left out of the list', () => {
    const without = designSymbols('aisc360-16-lrfd').filter((s) => s.symbol !== 'Fe');
    expect(undefinedIn('Fe = π²E/(Lc/r)²', without)).toEqual(['Fe']);
    expect(undefinedIn('Nb,Rd = χ·A·fy/γM1', designSymbols('aisc360-16-lrfd'))).not.toEqual([]);
  });
});

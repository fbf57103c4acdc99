import { describe, expect, it } from 'vitest';
import type { LoadCategory } from '@shared/model/truss';
import {
  COMBINATION_SETS,
  CombinationError,
  combinationApply,
  combinationsBuild,
  combinationsExplain,
  combinationsIgnoredCases,
  type CodeCombination,
} from './index';

const cases = (...list: Array<[string, LoadCategory]>) => list.map(([id, category]) => ({ id, category }));

/** The largest and smallest combined value, with the combination that gives it. */
function extremes(combos: CodeCombination[], values: Record<string, number>) {
  const results = combos.map((c) => ({ name: c.name, value: combinationApply(c, values) }));
  const max = results.reduce((a, b) => (b.value > a.value ? b : a));
  const min = results.reduce((a, b) => (b.value < a.value ? b : a));
  return { results, max, min };
}

describe('ASCE/SEI 7-16 strength design (LRFD)', () => {
  // ASCE/SEI 7-16 §2.3.1 (from memory, high confidence):
  // (1) 1.4D  (2) 1.2D + 1.6L + 0.5(Lr or S or R)  (3) 1.2D + 1.6(Lr or S or R) + (L or 0.5W)
  // (4) 1.2D + 1.0W + L + 0.5(Lr or S or R)  (5) 0.9D + 1.0W
  it('when D, S and W are present, then (1), (3) and (4) are formed with and without each companion load, and (2) is not (no L)', () => {
    // §2.3.1: "where the effects of one or more loads not acting" shall be investigated, so the
    // companion 0.5W of (3) and 0.5S of (4) are each also left out; (2) is led by L, which has no case.
    const combos = combinationsBuild('asce7-16-strength', cases(['D', 'dead'], ['S', 'snow'], ['W', 'wind']));
    expect(combos.map((c) => [c.name, c.factors])).toEqual([
      ['LRFD 1: D; S, W not acting', { D: 1.4 }],
      ['LRFD 3a: D + S + W', { D: 1.2, S: 1.6, W: 0.5 }],
      ['LRFD 3b: D + S; W not acting', { D: 1.2, S: 1.6 }],
      ['LRFD 4a: D + W + S', { D: 1.2, W: 1.0, S: 0.5 }],
      ['LRFD 4b: D + W; S not acting', { D: 1.2, W: 1.0 }],
      ['LRFD 5: D + W; S not acting', { D: 0.9, W: 1.0 }],
    ]);
    expect(combos[2].clause).toBe('ASCE/SEI 7-16 §2.3.1 (3)');
    expect(combos[2].acting).toEqual(['D', 'S']);
    expect(combos[2].notActing).toEqual(['W']);
    expect(combos[1].expression).toBe('1.2 D + 1.6 S + 0.5 W');
  });

  it('when D = 15, Lr = 20 and S = 25 psf, then 1.2D + 1.6S = 58.0 psf governs', () => {
    // Worked check from the factors of ASCE/SEI 7-16 §2.3.1: (1) 21.0, (3) 58.0 psf. (2) is led
    // by 1.6L and there is no live case, so it is not formed (its 1.2D + 0.5S = 30.5 psf is below (3)).
    const combos = combinationsBuild('asce7-16-strength', cases(['D', 'dead'], ['Lr', 'roof-live'], ['S', 'snow']));
    const { results, max } = extremes(combos, { D: 15, Lr: 20, S: 25 });
    expect(max.value).toBeCloseTo(58.0, 10);
    expect(combos.find((c) => c.name === max.name)!.clause).toBe('ASCE/SEI 7-16 §2.3.1 (3)');
    expect(results.find((r) => r.name.startsWith('LRFD 1'))!.value).toBeCloseTo(21.0, 10);
    // (2) is led by L and (4) by W: neither has a case, so neither is formed.
    expect(combos.filter((c) => c.rule === '2' || c.rule === '4')).toHaveLength(0);
  });

  it('when D = 15 psf and wind uplift W = −18 psf, then 0.9D + 1.0W = −4.5 psf is the least', () => {
    // ASCE/SEI 7-16 §2.3.1 (5).
    const combos = combinationsBuild('asce7-16-strength', cases(['D', 'dead'], ['W', 'wind']));
    const { min } = extremes(combos, { D: 15, W: -18 });
    expect(min.value).toBeCloseTo(-4.5, 10);
    expect(min.name).toBe('LRFD 5: D + W');
  });
});

describe('ASCE/SEI 7-16 allowable stress design (ASD)', () => {
  // ASCE/SEI 7-16 §2.4.1 (from memory, high confidence): (1) D (2) D + L (3) D + (Lr or S or R)
  // (4) D + 0.75L + 0.75(Lr or S or R) (5) D + 0.6W (6) D + 0.75L + 0.75(0.6W) + 0.75(Lr or S or R)
  // (7) 0.6D + 0.6W
  it('when D = 15, Lr = 20 and S = 25 psf, then D + S = 40.0 psf governs and D + 0.75S = 33.75 psf', () => {
    const combos = combinationsBuild('asce7-16-asd', cases(['D', 'dead'], ['Lr', 'roof-live'], ['S', 'snow']));
    const { results, max } = extremes(combos, { D: 15, Lr: 20, S: 25 });
    expect(max.value).toBeCloseTo(40.0, 10);
    expect(combos.find((c) => c.name === max.name)!.clause).toBe('ASCE/SEI 7-16 §2.4.1 (3)');
    expect(results.find((r) => r.name.startsWith('ASD 4b'))!.value).toBeCloseTo(33.75, 10);
  });

  it('when D = 15 psf and W = −18 psf, then 0.6D + 0.6W = −1.8 psf is the least', () => {
    const combos = combinationsBuild('asce7-16-asd', cases(['D', 'dead'], ['W', 'wind']));
    const { min } = extremes(combos, { D: 15, W: -18 });
    expect(min.value).toBeCloseTo(-1.8, 10);
    expect(combos.find((c) => c.name === min.name)!.clause).toBe('ASCE/SEI 7-16 §2.4.1 (7)');
  });

  it('when wind accompanies live and snow in (6), then its factor is 0.75 × 0.6 = 0.45 and the note says so', () => {
    const combos = combinationsBuild('asce7-16-asd', cases(['D', 'dead'], ['L', 'live'], ['S', 'snow'], ['W', 'wind']));
    const six = combos.filter((c) => c.rule === '6');
    expect(six[0].factors).toEqual({ D: 1, L: 0.75, W: 0.45, S: 0.75 });
    expect(six[0].factorNotes.W).toContain('0.75 × 0.6 = 0.45');
    expect(six[0].factorNotes.W).toContain('§2.4.1 (6)');
  });

  it('when D, S and W are present, then (6) is formed with and without each load, and identical combinations are listed once', () => {
    // §2.4.1 (1) D, (3) D + S, (4) D + 0.75S, (5) D + 0.6W, (6) D + 0.75(0.6W) + 0.75S, (7) 0.6D + 0.6W;
    // (6) without W is D + 0.75S, the same factors as (4): listed once, under (4).
    const combos = combinationsBuild('asce7-16-asd', cases(['D', 'dead'], ['S', 'snow'], ['W', 'wind']));
    expect(combos.map((c) => [c.rule, c.factors])).toEqual([
      ['1', { D: 1 }],
      ['3', { D: 1, S: 1 }],
      ['4', { D: 1, S: 0.75 }],
      ['5', { D: 1, W: 0.6 }],
      ['6', { D: 1, W: 0.45, S: 0.75 }],
      ['6', { D: 1, W: 0.45 }],
      ['7', { D: 0.6, W: 0.6 }],
    ]);
    expect(combos[2].alsoBy).toEqual(['ASCE/SEI 7-16 §2.4.1 (6)']);
  });
});

describe('EN 1990:2002+A1 fundamental combination', () => {
  // EN 1990 eq. (6.10), (6.10a), (6.10b); Table A1.2(B): γ_G,sup 1.35, γ_Q 1.5, ξ 0.85;
  // Table A1.1: ψ0 snow (≤ 1000 m) 0.5, wind 0.6 (from memory).
  const snowAndWind = cases(['G', 'dead'], ['S', 'snow'], ['W', 'wind']);
  const values = { G: 2.0, S: 1.0, W: 0.5 };

  const byFactors = (combos: CodeCombination[], factors: Record<string, number>) =>
    combos.find((c) => JSON.stringify(c.factors) === JSON.stringify(factors))!;

  it('when G = 2.0, S = 1.0 and W = 0.5 kPa by (6.10), then snow leading gives 4.65 kPa and wind leading 4.20 kPa', () => {
    const combos = combinationsBuild('en1990-6.10', snowAndWind);
    expect(combinationApply(byFactors(combos, { G: 1.35, S: 1.5, W: 0.9 }), values)).toBeCloseTo(4.65, 10);
    expect(combinationApply(byFactors(combos, { G: 1.35, W: 1.5, S: 0.75 }), values)).toBeCloseTo(4.2, 10);
    expect(combinationApply(byFactors(combos, { G: 1.35 }), values)).toBeCloseTo(2.7, 10);
  });

  it('when G, S and W are present by (6.10), then each leading action is formed with γ_G,sup and γ_G,inf and with and without its companion', () => {
    // Table A1.2(B): γ_G,sup 1.35 / γ_G,inf 1.00 on the whole permanent action, γ_Q 1.5 (0 where
    // favourable); ψ0 snow 0.5, wind 0.6 (Table A1.1). No imposed-load case: nothing led by Q or H.
    const combos = combinationsBuild('en1990-6.10', snowAndWind);
    expect(combos.map((c) => [c.rule, c.factors])).toEqual([
      ['6.10 G', { G: 1.35 }],
      ['6.10 G', { G: 1 }],
      ['6.10 leading snow', { G: 1.35, S: 1.5, W: 0.9 }],
      ['6.10 leading snow', { G: 1.35, S: 1.5 }],
      ['6.10 leading snow', { G: 1, S: 1.5, W: 0.9 }],
      ['6.10 leading snow', { G: 1, S: 1.5 }],
      ['6.10 leading wind', { G: 1.35, W: 1.5, S: 0.75 }],
      ['6.10 leading wind', { G: 1.35, W: 1.5 }],
      ['6.10 leading wind', { G: 1, W: 1.5, S: 0.75 }],
      ['6.10 leading wind', { G: 1, W: 1.5 }],
    ]);
    expect(combos[9].name).toBe('EN 6.10 leading wind (d): G + W; S not acting');
    expect(combos[9].factorNotes.G).toContain('γ_G,inf = 1.00');
  });

  it('when the same loads are combined by (6.10a) and (6.10b), then 3.90, 4.245 and 3.795 kPa result and 4.245 kPa governs', () => {
    const combos = combinationsBuild('en1990-6.10ab', snowAndWind);
    expect(combinationApply(byFactors(combos, { G: 1.35, S: 0.75, W: 0.9 }), values)).toBeCloseTo(3.9, 10);
    expect(combinationApply(byFactors(combos, { G: 1.1475, S: 1.5, W: 0.9 }), values)).toBeCloseTo(4.245, 10);
    expect(combinationApply(byFactors(combos, { G: 1.1475, W: 1.5, S: 0.75 }), values)).toBeCloseTo(3.795, 10);
    expect(extremes(combos, values).max.value).toBeCloseTo(4.245, 10);
    // (6.10a): 2 × 2 × 2 presence patterns; (6.10b) leading snow and leading wind: 2 × 2 each.
    expect(combos.filter((c) => c.rule === '6.10a')).toHaveLength(8);
    expect(combos).toHaveLength(16);
    const b = byFactors(combos, { G: 1.1475, S: 1.5, W: 0.9 });
    expect(b.factorNotes.G).toContain('ξ');
    expect(b.factorNotes.W).toContain('ψ0');
    expect(b.clause).toBe('EN 1990:2002+A1 eq. (6.10b), Table A1.2(B), Table A1.1');
  });

  it('when roof imposed load H is present with snow and wind, then H leads alone (EN 1991-1-1 §3.3.2(1)) and never accompanies (ψ0 = 0)', () => {
    const combos = combinationsBuild('en1990-6.10', cases(['G', 'dead'], ['H', 'roof-live'], ['S', 'snow'], ['W', 'wind']));
    const hLead = combos.filter((c) => c.rule === '6.10 leading roof imposed');
    expect(hLead.map((c) => c.factors)).toEqual([
      { G: 1.35, H: 1.5 },
      { G: 1, H: 1.5 },
    ]);
    expect(hLead[0].clause).toContain('EN 1991-1-1:2002 §3.3.2(1)');
    expect(combos.filter((c) => c.rule !== '6.10 leading roof imposed').some((c) => 'H' in c.factors)).toBe(false);
    const notes = COMBINATION_SETS.find((s) => s.id === 'en1990-6.10')!.notes.join(' ');
    expect(notes).toContain('§3.3.2(1)');
    expect(notes).toMatch(/would not be "on the safe side"/);
  });

  it('when there is no imposed-load case, then no combination is led by imposed load', () => {
    const combos = combinationsBuild('en1990-6.10ab', cases(['G', 'dead'], ['S', 'snow']));
    expect(combos.some((c) => /leading (imposed|roof imposed)/.test(c.rule))).toBe(false);
    expect(combos.map((c) => c.rule)).toEqual(['6.10a', '6.10a', '6.10a', '6.10a', '6.10b leading snow', '6.10b leading snow']);
  });
});

describe('alternatives, skipping and traceability', () => {
  it('when only dead load is present, then each set keeps just its permanent-only combination', () => {
    const dead = cases(['D', 'dead']);
    expect(combinationsBuild('asce7-16-strength', dead).map((c) => c.expression)).toEqual(['1.4 D']);
    expect(combinationsBuild('asce7-16-asd', dead).map((c) => c.expression)).toEqual(['1 D']);
    // EN: γ_G,sup and γ_G,inf (Table A1.2(B)) on the permanent action alone.
    expect(combinationsBuild('en1990-6.10', dead).map((c) => c.expression)).toEqual(['1.35 D', '1 D']);
    expect(combinationsBuild('en1990-6.10ab', dead).map((c) => c.expression)).toEqual(['1.35 D', '1 D']);
  });

  it('when there are two dead cases and two wind cases, then the dead cases act together and the wind cases are alternatives', () => {
    const combos = combinationsBuild('asce7-16-strength', cases(['D1', 'dead'], ['D2', 'dead'], ['WL', 'wind'], ['WR', 'wind']));
    const five = combos.filter((c) => c.rule === '5');
    expect(five.map((c) => c.factors)).toEqual([
      { D1: 0.9, D2: 0.9, WL: 1 },
      { D1: 0.9, D2: 0.9, WR: 1 },
    ]);
    expect(five.map((c) => c.name)).toEqual(['LRFD 5a: D1 + D2 + WL; WR not acting', 'LRFD 5b: D1 + D2 + WR; WL not acting']);
  });

  it('when no dead case exists, then variable-only combinations are still built, 1.4D is skipped and (2) is not led by a missing L', () => {
    const combos = combinationsBuild('asce7-16-strength', cases(['S', 'snow']));
    expect(combos.map((c) => c.rule)).toEqual(['3']);
    expect(combos[0].factors).toEqual({ S: 1.6 });
  });

  it('when any set is built over all categories, then every factor has a note naming its clause', () => {
    const all = cases(['D', 'dead'], ['L', 'live'], ['Lr', 'roof-live'], ['S', 'snow'], ['W', 'wind']);
    for (const set of COMBINATION_SETS) {
      const combos = combinationsBuild(set.id, all);
      expect(combos.length).toBeGreaterThan(0);
      expect(new Set(combos.map((c) => c.name)).size).toBe(combos.length);
      for (const combo of combos) {
        for (const caseId of Object.keys(combo.factors)) {
          expect(combo.factorNotes[caseId]).toMatch(/ASCE\/SEI 7-16 §2\.[34]\.1 \(\d\)|EN 1990 eq\. \(6\.10[ab]?\)/);
        }
        expect(combo.name.length).toBeLessThanOrEqual(80);
      }
    }
  });

  it('when the sets are listed, then the ASCE sets say seismic is left out', () => {
    expect(COMBINATION_SETS.map((s) => s.id)).toEqual(['asce7-16-strength', 'asce7-16-asd', 'en1990-6.10', 'en1990-6.10ab']);
    for (const set of COMBINATION_SETS.filter((s) => s.id.startsWith('asce'))) {
      expect(set.notes.join(' ')).toMatch(/Seismic combinations are not included/);
    }
  });

  it("when a case has category 'other', then no built-in combination uses it and it is reported", () => {
    const list = cases(['D', 'dead'], ['X', 'other']);
    const combos = combinationsBuild('asce7-16-strength', list);
    expect(combos.some((c) => 'X' in c.factors)).toBe(false);
    expect(combinationsIgnoredCases(list)).toEqual([{ caseId: 'X', reason: expect.stringContaining("category 'other'") }]);
  });
});

describe('bad input', () => {
  it('when the set id is unknown, then an unknown-set error lists the sets', () => {
    expect(() => combinationsBuild('asce7-22' as never, [])).toThrowError(/asce7-16-strength/);
  });

  it('when two cases share an id, then a duplicate-load-case error names it', () => {
    try {
      combinationsBuild('asce7-16-asd', cases(['D', 'dead'], ['D', 'snow']));
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(CombinationError);
      expect((error as CombinationError).code).toBe('duplicate-load-case');
      expect((error as CombinationError).message).toContain('"D"');
    }
  });

  it('when a category is unknown, then an unknown-category error names the case', () => {
    expect(() => combinationsBuild('en1990-6.10', [{ id: 'E', category: 'seismic' as never }])).toThrowError(/Load case "E"/);
  });

  it('when a combination is applied without a value for one of its cases, then the case is named', () => {
    expect(() => combinationApply({ name: 'LRFD 1', factors: { D: 1.4 } }, {})).toThrowError(/"D"/);
    expect(() => combinationApply({ name: 'LRFD 1', factors: { D: 1.4 } }, { D: Number.NaN })).toThrowError(CombinationError);
  });
});

describe('reasons of a combination list', () => {
  it('when ASD is formed from D, S and W, then the outcome of each §2.4.1 rule matches the standard: (2) not formed, (6) without W listed once under (4)', () => {
    // ASCE/SEI 7-16 §2.4.1 (from memory): (2) D + L needs L; (6) D + 0.75(0.6W) + 0.75S with W absent is D + 0.75S = (4).
    const ex = combinationsExplain('asce7-16-asd', cases(['D', 'dead'], ['S', 'snow'], ['W', 'wind']));
    expect(ex.combinations).toEqual(combinationsBuild('asce7-16-asd', cases(['D', 'dead'], ['S', 'snow'], ['W', 'wind'])));
    const rule = (id: string) => ex.rules.find((r) => r.id === id)!;
    expect(rule('2').formed).toEqual([]);
    expect(rule('2').notFormed).toMatch(/led by live/);
    expect(rule('4').formed.map((f) => f.expression)).toEqual(['1 D + 0.75 S']);
    expect(rule('6').formed.map((f) => f.expression)).toEqual(['1 D + 0.45 W + 0.75 S', '1 D + 0.45 W']);
    expect(rule('6').duplicates).toEqual([{ acting: '1 D + 0.75 S', sameAs: rule('4').formed[0].name }]);
    expect(ex.rules.map((r) => r.id)).toEqual(['1', '2', '3', '4', '5', '6', '7']);
  });

  it('when there is no variable case, then the rules that need one say they would repeat the permanent-only combination', () => {
    const ex = combinationsExplain('asce7-16-strength', cases(['D', 'dead']));
    expect(ex.combinations.map((c) => c.factors)).toEqual([{ D: 1.4 }]);
    // (2)-(5) are each led by L, Lr/S or W: none has a case.
    for (const id of ['2', '3', '4', '5']) expect(ex.rules.find((r) => r.id === id)!.notFormed).toMatch(/^not formed: it is led by/);
  });
});

import { describe, expect, it } from 'vitest';
import { combinationsBuild, type CombinationSetId } from '@shared/combinations';
import type { LoadCase, TrussModel } from '@shared/model/truss';
import { renderCalcSheetHtml } from '../calc-sheet-html';
import { buildCalcSheetView } from './index';
import { sheetInput, triangleModel } from './view-fixtures';

/** The triangle with dead D and wind W, plus the extra cases given, all at the apex C, and the set's combinations as the app saves them. */
function modelWith(setId: CombinationSetId, extra: Pick<LoadCase, 'id' | 'category'>[]): TrussModel {
  const model = triangleModel(['D', 'W']);
  const apex = model.joints.find((j) => j.tag === 'C')!.id;
  for (const c of extra) model.loadCases.push({ ...c, name: c.id, loads: [{ joint: apex, fx: 0, fy: -5 }] });
  model.combinations = combinationsBuild(setId, model.loadCases).map((c) => ({ name: c.name, factors: c.factors, clause: c.clause }));
  return model;
}

describe('sheet view: reasons for the combination list', () => {
  it('when ASD combinations are formed from D, S and W, then each rule of ASCE/SEI 7-16 §2.4.1 says what it formed, (2) is not formed, and (6) without wind is listed once under (4)', () => {
    const [reasons] = buildCalcSheetView(sheetInput(modelWith('asce7-16-asd', [{ id: 'S', category: 'snow' }]))).combinationReasons;
    expect(reasons.asFormed).toBe(true);
    const of = (n: number) => reasons.lines.filter((l) => l.startsWith(`ASCE/SEI 7-16 §2.4.1 (${n}),`));
    // §2.4.1 (2) D + L: led by L, and there is no live-load case.
    expect(of(2)).toEqual(['ASCE/SEI 7-16 §2.4.1 (2), D + L: not formed: it is led by live (imposed) load, and no load case has that category.']);
    // (4) D + 0.75L + 0.75(Lr or S or R): with no L, only D + 0.75S.
    expect(of(4)).toHaveLength(1);
    expect(of(4)[0]).toMatch(/: one combination: ASD 4: .* \(1 D \+ 0\.75 S\)\.$/);
    // (6) D + 0.75L + 0.75(0.6W) + 0.75(Lr or S or R): W present or not, S present or not, no L;
    // with W absent it is D + 0.75S, the factors of (4).
    expect(of(6)[0]).toMatch(/: 2 combinations: ASD 6a: .*\(1 D \+ 0\.45 W \+ 0\.75 S\); ASD 6b: .*\(1 D \+ 0\.45 W\)\.$/);
    expect(of(6)[1]).toMatch(/: 1 D \+ 0\.75 S has the same factors as ASD 4: D \+ S; W not acting, so it is listed once, there\.$/);
    expect(reasons.lines.some((l) => l.includes('"the effects of one or more loads not acting"'))).toBe(true);
    expect(reasons.lines[0]).toBe('Formed from ASCE/SEI 7-16 §2.4.1, combinations (1) to (7) over the load cases D (dead), W (wind), S (snow).');
  });

  it('when EN 1990 (6.10) combinations are formed with roof imposed load, snow and wind, then the EN 1991-1-1 §3.3.2(1) exclusion is written with the cases it keeps apart', () => {
    const view = buildCalcSheetView(sheetInput(modelWith('en1990-6.10', [{ id: 'S', category: 'snow' }, { id: 'H', category: 'roof-live' }])));
    const [reasons] = view.combinationReasons;
    expect(reasons.asFormed).toBe(true);
    expect(reasons.lines).toContain(
      'Here roof imposed load, category H (H), is not combined with snow (S) or wind (W) (EN 1991-1-1:2002 §3.3.2(1)): it leads only with the permanent actions, and with ψ0 = 0 (EN 1990 Table A1.1) it accompanies nothing.',
    );
    // H leads with γ_G,sup = 1.35 and with γ_G,inf = 1.00 and γ_Q = 1.5 (EN 1990 Table A1.2(B)), nothing else.
    const hLead = reasons.lines.find((l) => l.includes('γ_Q H'))!;
    expect(hLead).toMatch(/: 2 combinations: EN 6\.10 leading roof imposed \(a\): [^(]*\(1\.35 D \+ 1\.5 H\); EN 6\.10 leading roof imposed \(b\): [^(]*\(1 D \+ 1\.5 H\)\.$/);
    // No imposed-load (category A/B) case: nothing is led by Q.
    expect(reasons.lines.find((l) => l.includes('γ_Q Q'))).toMatch(/not formed: it is led by live \(imposed\) load, and no load case has that category\.$/);
  });

  it('when a formed combination is edited by hand, then the sheet says the combinations differ from the set instead of giving its reasons', () => {
    const model = modelWith('asce7-16-strength', []);
    model.combinations[1] = { ...model.combinations[1], factors: { ...model.combinations[1].factors, W: 0.8 } };
    const [reasons] = buildCalcSheetView(sheetInput(model)).combinationReasons;
    expect(reasons.asFormed).toBe(false);
    expect(reasons.lines).toHaveLength(1);
    expect(reasons.lines[0]).toContain(`1 of the ${model.combinations.length} it forms from these load cases is missing or changed (${model.combinations[1].name})`);
    expect(reasons.lines[0]).toContain(`1 combination citing it is not among them (${model.combinations[1].name})`);
  });

  it('when the combinations are written by hand without a clause, then no reasons are claimed; with a set, they print under the combination table', () => {
    const hand = triangleModel(['D', 'W'], [{ name: 'U1', factors: { D: 1.4 } }]);
    expect(buildCalcSheetView(sheetInput(hand)).combinationReasons).toEqual([]);
    const html = renderCalcSheetHtml(buildCalcSheetView(sheetInput(modelWith('asce7-16-asd', [{ id: 'S', category: 'snow' }]))));
    const loads = html.slice(html.indexOf('<section class="sheet-section" id="loads">'), html.indexOf('id="stability"'));
    expect(loads).toContain('<h3>Why these combinations: ASCE/SEI 7-16 allowable stress design (ASD), basic combinations</h3>');
    expect(loads).toContain('so it is listed once, there.');
  });
});

import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { hangerModel, openPanelModel, sheetInput, toggleModel, triangleModel } from './view-fixtures';
import { renderCalcSheetHtml } from '../calc-sheet-html';

// Count rule of plane trusses: stable and determinate needs m + r = 2j (and a full-rank
// equilibrium matrix); m + r − 2j > 0 is the degree of indeterminacy; m + r < 2j is a mechanism
// (e.g. Hibbeler, Structural Analysis, ch. 3 — from memory).
describe('sheet view: stability and determinacy', () => {
  it('when the triangle is built (m + r = 3 + 3 = 6 = 2j), then it is stable and determinate', () => {
    const { stability, cover } = buildCalcSheetView(sheetInput(triangleModel()));
    expect(stability.verdict).toBe('Stable and statically determinate');
    expect(stability.lines.length).toBeGreaterThan(0);
    expect(stability.lines.every((l) => l.includes('class="katex"'))).toBe(true);
    expect(cover.summary[0]).toEqual({ label: 'Stability', value: 'Stable and statically determinate' });
  });

  it('when the three-bar hanger is built (m + r = 3 + 6 = 9, 2j = 8), then it is indeterminate to degree 9 − 8 = 1', () => {
    expect(buildCalcSheetView(sheetInput(hangerModel())).stability.verdict).toBe(`Stable, statically indeterminate to degree ${3 + 6 - 2 * 4}`);
  });

  it('when the open panel is built (m + r = 4 + 3 = 7 < 2j = 8), then it is unstable, names mechanism joints and the cover leads with the finding', () => {
    const view = buildCalcSheetView(sheetInput(openPanelModel()));
    expect(view.stability.verdict).toBe('Unstable');
    const joints = view.stability.mechanism.split(', ');
    expect(joints.length).toBeGreaterThan(0);
    for (const j of joints) expect(['A', 'B', 'C', 'D']).toContain(j);
    expect(view.cover.summary).toEqual([
      { label: 'Finding', value: 'Unstable — no member forces are given' },
      { label: 'Joints of the mechanism', value: view.stability.mechanism },
    ]);
    expect(view.cover.contents).toEqual([
      { anchor: 'stability', title: 'Stability and determinacy — finding' },
      { anchor: 'geometry', title: 'Geometry' },
      { anchor: 'design-basis', title: 'Design basis and caution' },
    ]);
  });

  it('when the geometry is mirror-symmetric, then the section says so with the axis at half the span', () => {
    // The triangle's apex is at x = L/2 = 4 m.
    expect(buildCalcSheetView(sheetInput(triangleModel())).stability.symmetry).toContain('x = 4.000 m');
  });

  it('when a toggle is 1 mm from flat (1 kN gives P/(2 sin θ) ≈ 1 500 kN), then the section warns it is near a mechanism, names the middle joint, and the cover says so', () => {
    const view = buildCalcSheetView(sheetInput(toggleModel()));
    expect(view.stability.nearMechanism).toBe(true);
    expect(view.stability.conditioning).toMatch(/^Near a mechanism: the smallest singular value of the joint-equilibrium matrix is σmin = /);
    expect(view.stability.conditioning).toMatch(/near-mechanism are B:/);
    const near = view.cover.summary.find((s) => s.label === 'Near a mechanism');
    expect(near?.value).toMatch(/^1 kN can raise 3000 kN; joints B$/);
    const html = renderCalcSheetHtml(view);
    expect(html).toMatch(/id="conditioning"[^>]*>\s*<strong>Warning\.<\/strong> Near a mechanism/);
  });

  it('when the triangle is built, then the section gives its conditioning without a warning', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel()));
    expect(view.stability.nearMechanism).toBe(false);
    expect(view.stability.conditioning).toMatch(/^Well away from a mechanism/);
    expect(view.cover.summary.some((s) => s.label === 'Near a mechanism')).toBe(false);
  });
});

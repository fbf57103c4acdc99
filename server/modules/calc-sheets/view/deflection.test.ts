import { describe, expect, it } from 'vitest';
import { runDesign } from '@shared/design/basis';
import { trussSolve } from '@shared/solver';
import { buildCalcSheetView } from './index';
import { sheetInput, triangleModel } from './view-fixtures';

/**
 * The 3-4-5 triangle under case D (P = 12 kN down at C), every member A = 1000 mm², E = 200 000 MPa.
 * Unit-load method by hand (virtual work, any structural analysis text, from memory):
 *   N: AC = BC = −10 kN, AB = +8 kN; n for 1 kN up at C: AC = BC = +5/6, AB = −2/3;
 *   δy = Σ n·N·L/(A·E) = [2 × (5/6)(−10 000 N)(5000) + (−2/3)(8000 N)(8000)] / (1000 × 200 000) = −0.63 mm.
 *   n for 1 kN right at C (case W of the fixtures per kN): AB = +1/2, AC = +5/8, BC = −5/8;
 *   δx = [(5/8)(−10 000)(5000) + (−5/8)(−10 000)(5000) + (1/2)(8000)(8000)] / (1000 × 200 000) = +0.16 mm
 *   (the rafters cancel; the stretched tie carries the roller end, and C with it, half its elongation).
 * Allowed: span 8000 mm / 240 = 33.33 mm.
 */
/** The fixtures' triangle under D, one design group (A = 1000 mm², A992), deflection asked at C. */
function triangleWithDeflection() {
  const base = triangleModel(['D']);
  const C = base.joints.find((j) => j.tag === 'C')!.id;
  return {
    ...base,
    design: {
      standard: 'aisc360-16-lrfd' as const,
      groups: [{ name: 'All', members: 'all' as const, material: { kind: 'grade' as const, grade: 'A992' }, section: { shape: 'properties' as const, A: 1000, rx: 30, ry: 30 } }],
      deflection: { joints: [C], combinations: ['D'], limit: 240 },
    },
  };
}

describe('sheet view: deflection page', () => {
  it('the unit-load table of C under D sums to the closed form −0.63 mm, against span/240', () => {
    const model = triangleWithDeflection();
    const analysis = trussSolve(model);
    const view = buildCalcSheetView(sheetInput(model, { analysis, design: runDesign(model, analysis) }));
    expect(view.deflection.present).toBe(true);
    expect(view.deflection.rows.map((r) => r.cells)).toEqual([['C', 'D', '0.16', '\u22120.63', '8000/240 = 33.33', String(Number((0.63 / (8000 / 240)).toPrecision(3))), 'OK']]);
    const [t] = view.deflection.tables;
    expect(t.rows.map((r) => r.cells[0]).sort()).toEqual(['AB', 'AC', 'BC']);
    expect(Number(t.rows.find((r) => r.cells[0] === 'AC')!.cells[1])).toBeCloseTo(5 / 6, 4);
    expect(t.sum).toBe('Σ = δy = \u22120.63 mm');
    expect(view.cover.contents.map((c) => c.anchor)).toContain('deflection');
    // The deflected shape: drawn exaggerated with its scale written (span 8000 mm, largest
    // movement √(0.16² + 0.63²) = 0.65 mm at C: 6 % of the span is ×738, rounded down to ×500).
    expect(view.deflection.shapes).toHaveLength(1);
    const svg = view.deflection.shapes[0].svg;
    expect(svg).toContain('Movements drawn 500 × their size');
    expect(svg).toContain('C: 0.65 mm');
    expect(view.deflection.shapesNote).toMatch(/direct stiffness method/);
  });

  it('a run stored before shapes existed says so instead of drawing nothing', () => {
    const model = triangleWithDeflection();
    const analysis = trussSolve(model);
    const { shapes: _dropped, ...old } = runDesign(model, analysis)!;
    const view = buildCalcSheetView(sheetInput(model, { analysis, design: old }));
    expect(view.deflection.shapes).toEqual([]);
    expect(view.deflection.shapesNote).toMatch(/run the truss again/);
  });

  it('no deflection request, no page', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D'])));
    expect(view.deflection.present).toBe(false);
    expect(view.cover.contents.map((c) => c.anchor)).not.toContain('deflection');
  });
});

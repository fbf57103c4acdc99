import { describe, expect, it } from 'vitest';
import { modelFromSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView } from './index';
import { katexText, sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: symbols typeset, never raw markup', () => {
  it('when a joint at a support is drawn, then its reaction label has the subscript lowered, not "R_A,y"', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel()));
    const jointA = view.cases[0].jointSteps.find((s) => s.title === 'Joint A')!;
    const svgText = jointA.svg!.replace(/<[^>]+>/g, '');
    expect(svgText).not.toMatch(/R_/);
    // R, then the subscript "A,y" in a smaller, lowered tspan, then the value.
    expect(jointA.svg).toMatch(/>R<tspan dy="[\d.]+" font-size="[\d.]+">A,y<\/tspan><tspan dy="-[\d.]+"> = /);
  });

  it('when a truss is solved by the stiffness method with a roller, then the displacement vector is typeset and the roller freedom is explained', () => {
    // A braced square (one redundant member) on a pin and a roller; invented.
    const model = modelFromSketch({
      joints: [['A', 0, 0], ['B', 3, 0], ['C', 3, 3], ['D', 0, 3]],
      members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A'], ['A', 'C'], ['B', 'D']],
      supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
      cases: [{ id: 'H', loads: [['D', 10, 0]] }],
      EA: 100_000,
    });
    const view = buildCalcSheetView(sheetInput(model));
    const assembly = view.cases[0].stiffnessSteps.find((s) => s.tex.some((l) => l.startsWith('\\mathbf{u} =')))!;
    const u = assembly.tex.find((l) => l.startsWith('\\mathbf{u} ='))!;
    expect(u).toMatch(/u_\{\\text\{C\}\}/);
    expect(u).not.toMatch(/\\text\{u_/);
    expect(u).toMatch(/t_\{\\text\{B\}\}/);
    const printed = assembly.lines.map((l) => katexText(l)).join(' ');
    expect(printed).toMatch(/along\s+its\s+rolling\s+line/);
    expect(printed).not.toMatch(/[uvt]_/);
  });
});

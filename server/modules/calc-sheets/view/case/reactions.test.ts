import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from '../index';
import { printed, sheetInput, TRIANGLE_REACTIONS, triangleModel } from '../view-fixtures';

describe('sheet view: support reactions', () => {
  it('when the apex load is vertical, then each support takes P/2 and the resultant equals it', () => {
    const [d] = buildCalcSheetView(sheetInput(triangleModel())).cases;
    const { A, B } = TRIANGLE_REACTIONS.D;
    expect(d.reactionRows.map((r) => r.cells)).toEqual([
      ['A', 'Pin', printed(A.rx, 2), printed(A.ry, 2), printed(Math.hypot(A.rx, A.ry), 2)],
      ['B', 'Roller', printed(B.rx, 2), printed(B.ry, 2), printed(Math.hypot(B.rx, B.ry), 2)],
    ]);
    expect(d.reactionSteps.length).toBeGreaterThan(0);
    expect(d.reactionSteps.every((s) => s.lines.every((l) => l.includes('class="katex"')))).toBe(true);
  });

  it('when the apex load is horizontal, then the pin takes −H across and moments about A give ∓H·h/L up and down', () => {
    const [, w] = buildCalcSheetView(sheetInput(triangleModel(['D', 'W']))).cases;
    const { A, B } = TRIANGLE_REACTIONS.W;
    expect(w.reactionRows.map((r) => r.cells.slice(2))).toEqual([
      [printed(A.rx, 2), printed(A.ry, 2), printed(Math.hypot(A.rx, A.ry), 2)], // −4.00, −1.50, 4.27
      [printed(B.rx, 2), printed(B.ry, 2), printed(Math.hypot(B.rx, B.ry), 2)], // 0.00, 1.50, 1.50
    ]);
  });
});

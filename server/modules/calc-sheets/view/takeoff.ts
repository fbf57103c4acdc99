import { takeoffStepKatex } from '@shared/takeoff';
import { loadLetterOf } from '@shared/solver';
import { alignedRows } from '@shared/text/breakable-tex';
import type { StepView } from './types';
import { equationHtml } from './format';
import type { SheetSection } from './context';

/**
 * The roof load takeoff, step by step, when the loads came from one. Each row of a step is an
 * equation of its own (alignedRows), typeset like the joint steps' equations so a long row wraps
 * at its relations instead of running off the page.
 */
export const takeoffSection: SheetSection<'takeoff'> = {
  build({ input, model, system }) {
    const takeoff: StepView[] = (input.takeoffSteps ?? []).map((s) => {
      const tex = alignedRows(takeoffStepKatex(s, { system, loadLetter: loadLetterOf(model) }));
      return { id: s.id, title: s.title, lines: tex.map((t) => equationHtml(t)), tex, ...(s.note ? { note: s.note } : {}) };
    });
    return { view: { takeoff }, contents: takeoff.length ? [{ anchor: 'takeoff', title: 'Roof loading' }] : [] };
  },
};

import { takeoffStepKatex } from '@shared/takeoff';
import { loadLetterOf } from '@shared/solver';
import type { StepView } from './types';
import { katexHtml } from './format';
import type { SheetSection } from './context';

/** The roof load takeoff, step by step, when the loads came from one. */
export const takeoffSection: SheetSection<'takeoff'> = {
  build({ input, model, system }) {
    const takeoff: StepView[] = (input.takeoffSteps ?? []).map((s) => {
      const tex = [takeoffStepKatex(s, { system, loadLetter: loadLetterOf(model) })];
      return { id: s.id, title: s.title, lines: tex.map((t) => katexHtml(t)), tex, ...(s.note ? { note: s.note } : {}) };
    });
    return { view: { takeoff }, contents: takeoff.length ? [{ anchor: 'takeoff', title: 'Roof loading' }] : [] };
  },
};

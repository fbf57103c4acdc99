import { buildCalcSheetView } from './calc-sheet-view';
import type { CalcSheetView, StepView } from './view/types';
import { loadRunSheet } from './run-sheet.service';

/** How the sheet refers to one of its parts: its printed number ("6.4", or "6" for a section) and title. */
export interface SheetPlace {
  number: string;
  title: string;
}

/**
 * Every numbered part of a built sheet by its anchor: the worked steps as numbered by
 * view/index.ts (section number, a dot, place in the section) and the sections themselves.
 */
export function sheetPlaces(view: CalcSheetView): Map<string, SheetPlace> {
  const places = new Map<string, SheetPlace>();
  const titles = new Map(view.cover.contents.map((c) => [c.anchor, c.title]));
  for (const [anchor, number] of Object.entries(view.numbers)) places.set(anchor, { number, title: titles.get(anchor) ?? anchor });
  const steps: StepView[] = [
    view.stability,
    ...view.takeoff,
    ...view.cases.flatMap((c) => [...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check]),
  ];
  for (const s of steps) if (s?.number) places.set(s.id, { number: s.number, title: s.title });
  return places;
}

/**
 * The place of a comment's anchor: the step itself, or else the section it lies in (a table
 * or sub-heading id starts with its section's anchor, e.g. "case-D-forces" in "case-D").
 * Null for an anchor the sheet does not number.
 */
export function placeOf(anchor: string, places: Map<string, SheetPlace>): SheetPlace | null {
  const exact = places.get(anchor);
  if (exact) return exact;
  let best: string | null = null;
  for (const key of places.keys()) {
    if (!places.get(key)!.number.includes('.') && (anchor.startsWith(`${key}-`) || anchor.startsWith(`${key}/`))) {
      if (!best || key.length > best.length) best = key;
    }
  }
  return best ? places.get(best)! : null;
}

/** The numbered places of the sheet of a stored run, as its revisions print it. */
export async function runSheetPlaces(runId: number): Promise<Map<string, SheetPlace>> {
  const base = await loadRunSheet(runId);
  return sheetPlaces(buildCalcSheetView({ ...base, revision: '', generatedAt: new Date(0) }));
}

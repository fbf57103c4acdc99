import { sheetContext, type SectionKeys } from './context';
import { coverOf } from './cover';
import { titleBlockSection } from './title-block';
import { designBasisSection } from './design-basis';
import { geometrySection } from './geometry';
import { supportsSection } from './supports';
import { takeoffSection } from './takeoff';
import { loadsSection } from './loads';
import { combinationReasonsSection } from './combination-reasons';
import { stabilitySection } from './stability';
import { casesSection } from './cases';
import { combinationsSection } from './combinations';
import { envelopeSection } from './envelope';
import { bearingsSection } from './bearings';
import { residualSection } from './residual';
import type { CalcSheetInput, CalcSheetView, StepView } from './types';
import { deflectionSection } from './deflection';
import { designChecksSection } from './design-checks';
import { revisionTableSection } from './revision-table';

/**
 * The sections of the sheet in the order of its contents. A new section is a new file in this
 * folder (a `SheetSection` naming the view fields it fills) and one line here.
 */
const SECTIONS = [
  titleBlockSection,
  revisionTableSection,
  designBasisSection,
  geometrySection,
  supportsSection,
  takeoffSection,
  loadsSection,
  combinationReasonsSection,
  stabilitySection,
  casesSection,
  combinationsSection,
  envelopeSection,
  bearingsSection,
  deflectionSection,
  designChecksSection,
  residualSection,
] as const;

/** An unstable truss's sheet leads with the finding and lists only these sections, in this order. */
const UNSTABLE_CONTENTS = ['stability', 'geometry', 'design-basis'];

// Compile-time check that the sections (and the cover) fill every field of the view.
type Unfilled = Exclude<keyof CalcSheetView, SectionKeys<(typeof SECTIONS)[number]> | 'cover' | 'numbers'>;
const everyFieldFilled: [Unfilled] extends [never] ? true : Unfilled = true;
void everyFieldFilled;

/**
 * Builds the calc sheet's view from a model and its analysis. Every number is written with
 * its unit in the project's unit system (tables) — the joint-by-joint equations are the solver's
 * own KaTeX, in kN and m.
 */
export function buildCalcSheetView(input: CalcSheetInput): CalcSheetView {
  const ctx = sheetContext(input);
  const parts = SECTIONS.map((s) => s.build(ctx));
  const view = Object.assign({}, ...parts.map((p) => p.view)) as Omit<CalcSheetView, 'cover' | 'numbers'>;
  const listed = parts.flatMap((p) => p.contents ?? []);
  const contents = ctx.unstable ? UNSTABLE_CONTENTS.flatMap((a) => listed.filter((c) => c.anchor === a)) : listed;
  const summary = parts.flatMap((p) => p.summary ?? []);
  const built = { ...view, ...coverOf(ctx, view.units, contents, summary) };
  stepsNumber(built);
  return built;
}

/**
 * Numbers every worked step the way calc sheets are referenced: its section's number, a dot and
 * its place in the section ("6.4"). Steps of a section left out of the contents get none.
 */
function stepsNumber(view: CalcSheetView): void {
  const bySection: [string, StepView[]][] = [
    ['stability', [view.stability]],
    ['takeoff', view.takeoff],
    ...view.cases.map((c): [string, StepView[]] => [
      c.anchor,
      [...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check],
    ]),
  ];
  for (const [anchor, steps] of bySection) {
    const section = view.numbers[anchor];
    if (!section) continue;
    steps.forEach((s, i) => {
      s.number = `${section}.${i + 1}`;
    });
  }
}

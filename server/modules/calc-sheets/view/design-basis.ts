import type { TrussAnalysis } from '@shared/solver';
import type { SheetSection } from './context';
import type { CalcSheetInput } from './types';
import { DESIGN_CAUTION } from './design-checks';

const CAUTION =
  'These results are an aid to design and must be reviewed by a licensed professional engineer before they are used. ' +
  'Local building codes and the authority having jurisdiction govern; where they differ from the design basis stated here, they take precedence. ' +
  'The analysis assumes a plane, pin-jointed truss with loads applied at the joints, linear elastic behaviour and small displacements.';

/** The project's design basis, the clauses its combinations cite, the method and the caution. */
export const designBasisSection: SheetSection<'caution' | 'designBasis'> = {
  build({ input, model, analysis }) {
    const clauses = [...new Set(model.combinations.map((c) => c.clause).filter((c): c is string => !!c))];
    return {
      view: {
        caution: input.design ? `${CAUTION} ${DESIGN_CAUTION}` : CAUTION,
        designBasis: {
          paragraphs: (input.project.designBasis ?? '').split(/\n\s*\n/).map((p) => p.trim()).filter(Boolean),
          clauses,
          method: methodLines(input, analysis),
        },
      },
      contents: [{ anchor: 'design-basis', title: 'Design basis and caution' }],
    };
  },
};

/**
 * The method lines describe what this sheet actually does: the methods its cases were solved
 * by (not a general claim), how the roof loads were taken off, and how its numbers are printed.
 */
function methodLines(input: CalcSheetInput, analysis: TrussAnalysis): string[] {
  const lines = [
    'Plane truss, members pin-jointed at both ends, loads at the joints; member forces are axial, tension positive and marked (T), compression negative and marked (C).',
    'Stability and determinacy by the count m + r against 2j and by the rank of the joint-equilibrium matrix.',
  ];
  if (input.takeoffSteps?.length) {
    const reaction = input.takeoffSteps.find((s) => s.kind === 'purlin-reaction');
    const chosen = reaction?.kind === 'purlin-reaction' ? reaction.chosen : 'exact';
    lines.push(
      chosen === 'exact'
        ? 'Roof loads from area loads through purlins: tributary widths between purlins; each purlin a continuous beam over the trusses, its reaction on this truss by the three-moment equation (by tributary length shown beside it for comparison).'
        : 'Roof loads from area loads through purlins: tributary widths between purlins; each purlin’s reaction on this truss by tributary length (half of each adjacent span), the three-moment equation shown beside it for comparison.',
    );
    if (input.takeoffSteps.some((s) => s.kind === 'span-pattern')) {
      lines.push(
        'Partial loading of the continuous purlins (ASCE/SEI 7-16 4.3.3, 7.5): for the cases so marked, the pattern of loaded and empty spans that gives this truss its largest reaction, found over every pattern by superposition of single-span reactions; empty spans carry no load (at least the reaction with half the balanced snow load on them).',
      );
    }
    if (input.takeoffSteps.some((s) => s.kind === 'wind-purlin')) {
      lines.push('Wind normal to the roof: velocity pressure times each slope’s pressure coefficient on the sloped area, resolved into x and y at each purlin and carried to this truss like the other purlin loads.');
    }
  }
  const methods = new Set(analysis.cases.map((c) => c.method));
  if (analysis.cases.some((c) => c.zeroForce.length)) lines.push('Zero-force members by the two joint rules, repeated until nothing changes.');
  if (methods.has('stiffness')) {
    lines.push('Member forces by the direct stiffness method with each member’s EA (the truss is statically indeterminate); reactions from the equilibrium of the supported joints.');
  }
  if (methods.has('joints') || methods.has('joints-and-simultaneous')) {
    const atJoints = analysis.cases.some((c) => c.reactionNote);
    lines.push(
      atJoints
        ? 'Support reactions found with the member forces at the joints (global equilibrium alone cannot give them all).'
        : 'Support reactions from global equilibrium: moments about a support, then the sums of forces.',
    );
  }
  if (methods.has('joints')) lines.push('Member forces by the method of joints, joint by joint, each joint with at most two unknowns.');
  if (methods.has('joints-and-simultaneous')) {
    const simultaneous = analysis.cases.filter((c) => c.method === 'joints-and-simultaneous');
    const most = Math.max(0, ...simultaneous.flatMap((c) => c.simultaneousSteps.map((s) => s.unknowns.length)));
    const jointByJoint = simultaneous.some((c) => c.jointSteps.length > 0);
    lines.push(
      jointByJoint
        ? `Member forces by the method of joints while a joint has at most two unknowns; where none is left, the remaining unknowns (up to ${most} here) are solved together from the equilibrium equations of those joints, printed in full.`
        : `No joint has two or fewer unknowns, so the member forces (${most} unknowns) are solved together from the equilibrium equations of all the joints, printed in full.`,
    );
  }
  lines.push(
    'Results are printed to three decimals (kN, m). The numbers a step is worked from (cosines, lever arms, forces carried from earlier steps) are printed to as many more places as needed for the step, redone by hand from the printed numbers, to give the printed result.',
    'Every result is checked by an independent residual of equilibrium at every joint.',
  );
  return lines;
}

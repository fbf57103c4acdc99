import type { SheetSection } from './context';

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
        caution: CAUTION,
        designBasis: {
          paragraphs: (input.project.designBasis ?? '').split(/\n\s*\n/).map((p) => p.trim()).filter(Boolean),
          clauses,
          method: [
            'Plane truss, members pin-jointed at both ends, loads at the joints; member forces are axial, tension positive and marked (T), compression negative and marked (C).',
            'Stability and determinacy by the count m + r against 2j and by the rank of the joint-equilibrium matrix.',
            'Zero-force members by the two joint rules, repeated until nothing changes.',
            analysis.classification.kind === 'indeterminate'
              ? 'Member forces by the direct stiffness method with each member’s EA; reactions from the equilibrium of the supported joints.'
              : 'Support reactions from global equilibrium; member forces by the method of joints, joint by joint, each with at most two unknowns.',
            'Every result is checked by an independent residual of equilibrium at every joint.',
          ],
        },
      },
      contents: [{ anchor: 'design-basis', title: 'Design basis and caution' }],
    };
  },
};

import { scientificFormat } from '@shared/units';
import { RESIDUAL_RELATIVE_LIMIT, residualRatio, type SheetSection } from './context';

/** The equilibrium residual of every load case and combination, against the sheet's limit. */
export const residualSection: SheetSection<'residual' | 'comboResidualRows'> = {
  build({ analysis, fmt, unstable }) {
    const rows = analysis.cases.map((c) => {
      const ratio = residualRatio(c);
      return { cells: [c.caseId, fmt.num(c.check.largestLoad, 'force'), `${scientificFormat(c.residual, 3)}`, c.check.residualJointTag ?? '—', scientificFormat(ratio, 2), ratio <= RESIDUAL_RELATIVE_LIMIT ? 'OK' : 'NOT OK'] };
    });
    const ok = analysis.cases.every((c) => residualRatio(c) <= RESIDUAL_RELATIVE_LIMIT);
    const worst = Math.max(0, ...analysis.cases.map((c) => c.residual));
    return {
      view: {
        residual: {
          rows,
          ok,
          verdict: ok
            ? `Every load case is in equilibrium at every joint: the largest out-of-balance force is ${scientificFormat(worst, 3)} kN.`
            : 'At least one load case is NOT in equilibrium: do not use these results.',
        },
        comboResidualRows: analysis.combinations.map((c) => ({ cells: [c.name, c.clause ?? '—', scientificFormat(c.residual, 3)] })),
      },
      contents: [{ anchor: 'residual', title: 'Equilibrium residual check' }],
      summary: unstable ? [] : [{ label: 'Largest residual', value: `${scientificFormat(worst, 3)} kN — ${ok ? 'in equilibrium' : 'NOT in equilibrium'}` }],
    };
  },
};

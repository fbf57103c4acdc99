import { RESIDUAL_RELATIVE_LIMIT, residualRatio, type SheetSection } from './context';

/** The equilibrium residual of every load case and combination, against the sheet's limit. */
export const residualSection: SheetSection<'residual' | 'comboResidualRows'> = {
  build({ analysis, fmt, unstable }) {
    const rows = analysis.cases.map((c) => {
      const ratio = residualRatio(c);
      return { cells: [c.caseId, fmt.num(c.check.largestLoad, 'force'), `${c.residual.toExponential(2)}`, c.check.residualJointTag ?? '—', ratio.toExponential(1), ratio <= RESIDUAL_RELATIVE_LIMIT ? 'OK' : 'NOT OK'] };
    });
    const ok = analysis.cases.every((c) => residualRatio(c) <= RESIDUAL_RELATIVE_LIMIT);
    const worst = Math.max(0, ...analysis.cases.map((c) => c.residual));
    return {
      view: {
        residual: {
          rows,
          ok,
          verdict: ok
            ? `Every load case is in equilibrium at every joint: the largest out-of-balance force is ${worst.toExponential(2)} kN.`
            : 'At least one load case is NOT in equilibrium: do not use these results.',
        },
        comboResidualRows: analysis.combinations.map((c) => ({ cells: [c.name, c.clause ?? '—', c.residual.toExponential(2)] })),
      },
      contents: [{ anchor: 'residual', title: 'Equilibrium residual check' }],
      summary: unstable ? [] : [{ label: 'Largest residual', value: `${worst.toExponential(2)} kN — ${ok ? 'in equilibrium' : 'NOT in equilibrium'}` }],
    };
  },
};

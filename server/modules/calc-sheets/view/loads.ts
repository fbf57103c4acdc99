import { LOAD_CATEGORY_NAMES } from '@shared/model/truss';
import { factorsText } from './format';
import type { SheetSection } from './context';

const CATEGORY_NAMES: Record<string, string> = LOAD_CATEGORY_NAMES;

/** The load cases with their total vertical load, and the combinations with their factors and clauses. */
export const loadsSection: SheetSection<'loadCases' | 'combinations'> = {
  build({ model, fmt }) {
    return {
      view: {
        loadCases: {
          rows: model.loadCases.map((c) => ({
            cells: [
              c.id,
              c.name,
              CATEGORY_NAMES[c.category] ?? c.category,
              String(c.loads.length),
              fmt.qty(c.loads.reduce((s, l) => s - l.fy, 0), 'force'),
            ],
          })),
        },
        combinations: {
          rows: model.combinations.map((c) => ({ cells: [c.name, factorsText(c.factors), c.clause ?? '—'] })),
        },
      },
      contents: [{ anchor: 'loads', title: 'Load cases and combinations' }],
    };
  },
};

import type { CalcSheetView } from './types';
import type { SheetSection } from './context';

/** Columns of combinations per table, so a table fits the page width. */
const CHUNK = 6;

/** Member forces under every combination, in tables of six combinations. */
export const combinationsSection: SheetSection<'comboTables'> = {
  build({ model, analysis, fmt, unstable }) {
    const comboTables: CalcSheetView['comboTables'] = [];
    for (let i = 0; i < analysis.combinations.length; i += CHUNK) {
      const chunk = analysis.combinations.slice(i, i + CHUNK);
      comboTables.push({
        title: analysis.combinations.length > CHUNK ? `Combinations ${i + 1}–${i + chunk.length} of ${analysis.combinations.length}` : 'Combinations',
        head: chunk.map((c) => c.name),
        rows: model.members.map((m) => ({ cells: [m.tag, ...chunk.map((c) => fmt.memberNum(c.forces[m.id] ?? 0))] })),
      });
    }
    return {
      view: { comboTables },
      // One heading for the combination tables and the envelope that follows them.
      contents: [{ anchor: 'combinations', title: comboTables.length ? 'Combinations and envelope' : 'Envelope' }],
      summary: unstable ? [] : [{ label: 'Combinations', value: String(analysis.combinations.length) }],
    };
  },
};

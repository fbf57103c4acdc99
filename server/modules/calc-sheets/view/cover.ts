import { isoMinute } from './format';
import type { SheetContext } from './context';
import type { CalcSheetView, ContentsEntry, SummaryRow } from './types';

/**
 * The cover: what the sheet is about, the summary the sections gave and the contents they
 * listed, and the section numbers in that order. Built last, from the other sections' lines.
 */
export function coverOf(
  { input }: SheetContext,
  units: CalcSheetView['units'],
  contents: ContentsEntry[],
  summary: SummaryRow[],
): Pick<CalcSheetView, 'cover' | 'numbers'> {
  const { project } = input;
  return {
    cover: {
      rows: [
        { label: 'Project', value: project.name },
        { label: 'Job number', value: project.jobNumber },
        ...(project.client ? [{ label: 'Client', value: project.client }] : []),
        ...(project.site ? [{ label: 'Site', value: project.site }] : []),
        { label: 'Truss', value: input.trussName },
        { label: 'Revision', value: input.revision },
        { label: 'Units', value: `${units.system} (${units.force}, ${units.length})` },
        ...(input.runLabel ? [{ label: 'Analysis run', value: input.runLabel }] : []),
        { label: 'Generated', value: isoMinute(input.generatedAt) },
      ],
      summary,
      contents,
    },
    numbers: Object.fromEntries(contents.map((c, i) => [c.anchor, String(i + 1)])),
  };
}

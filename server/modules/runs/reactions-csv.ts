import type { TrussModel } from '@shared/model/truss';
import { REACTIONS_CSV_COLUMNS } from '@shared/schemas/run.schema';
import { reactionEnvelopeOf, type SupportReaction, type TrussAnalysis } from '@shared/solver';
import { csvField } from './forces-csv';

/** Force decimals in the CSV (kN): 0.001 kN = 1 N, as the member force CSV. */
const DECIMALS = 3;

/** Rounded to the CSV's decimals; a value that rounds to zero is written 0 (never -0). */
function kN(value: number): number {
  const rounded = Number(value.toFixed(DECIMALS));
  return rounded === 0 ? 0 : rounded;
}

/**
 * The support reactions of a solved run as CSV, for bearing and hold-down design: each support's
 * rx and ry under every load case and every combination, then per support the largest and least
 * of each component with the combination (or case) that gives it. Columns
 * {@link REACTIONS_CSV_COLUMNS}; CRLF line ends.
 */
export function reactionsCsv(model: TrussModel, analysis: TrussAnalysis): string {
  const tag = new Map(model.joints.map((j) => [j.id, j.tag]));
  const kind = new Map(model.supports.map((s) => [s.joint, s.kind === 'pin' ? 'pin' : `roller ${s.angleDeg ?? 90}°`]));
  const lines: string[] = [REACTIONS_CSV_COLUMNS.join(',')];
  const row = (cells: (string | number)[]) => lines.push(cells.map(csvField).join(','));
  const uplift = (ry: number) => (kN(ry) < 0 ? 'yes' : 'no');
  const each = (source: string, name: string, reactions: SupportReaction[]) => {
    for (const r of reactions) row([source, name, tag.get(r.joint) ?? r.joint, kind.get(r.joint) ?? r.kind, kN(r.rx), kN(r.ry), '', uplift(r.ry)]);
  };
  for (const c of analysis.cases) each('case', c.caseId, c.reactions);
  for (const c of analysis.combinations) each('combination', c.name, c.reactions);
  for (const e of reactionEnvelopeOf(analysis)) {
    const at = [e.at, kind.get(e.joint) ?? ''];
    row(['envelope', 'rx max', ...at, kN(e.rxMax), '', e.rxMaxCombo ?? '', '']);
    row(['envelope', 'rx min', ...at, kN(e.rxMin), '', e.rxMinCombo ?? '', '']);
    row(['envelope', 'ry max', ...at, '', kN(e.ryMax), e.ryMaxCombo ?? '', uplift(e.ryMax)]);
    row(['envelope', 'ry min', ...at, '', kN(e.ryMin), e.ryMinCombo ?? '', uplift(e.ryMin)]);
  }
  return lines.join('\r\n') + '\r\n';
}

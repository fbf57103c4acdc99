import type { TrussModel } from '@shared/model/truss';
import type { TrussAnalysis } from '@shared/solver';
import { FORCES_CSV_COLUMNS } from '@shared/schemas/run.schema';

/** Force decimals in the CSV (kN): 0.001 kN = 1 N. */
const DECIMALS = 3;

/**
 * One CSV field (RFC 4180): quoted when it holds a comma, quote or line break, quotes doubled.
 * Text that a spreadsheet would run as a formula (= + - @ at the start) gets a leading
 * apostrophe; numbers are written as numbers.
 */
export function csvField(value: string | number): string {
  if (typeof value === 'number') return String(value);
  const text = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Rounded force and its sense as the table shows them: a force that rounds to 0 is '0'. */
function forceCells(value: number): [number, string] {
  const rounded = Number(value.toFixed(DECIMALS));
  if (rounded === 0) return [0, '0'];
  return [rounded, rounded > 0 ? 'T' : 'C'];
}

/**
 * The member force table of a solved run as CSV: one row per member for every load case, every
 * combination, and the envelope's maximum tension, maximum compression and governing force.
 * Columns: {@link FORCES_CSV_COLUMNS}; force in kN, tension positive; sense T, C or 0;
 * `governing` names the combination (or case) an envelope row comes from. CRLF line ends.
 */
export function forcesCsv(model: TrussModel, analysis: TrussAnalysis): string {
  const tagOf = new Map(model.joints.map((j) => [j.id, j.tag]));
  const members = model.members.map((m) => ({ id: m.id, tag: m.tag, group: m.group ?? '', from: tagOf.get(m.from) ?? m.from, to: tagOf.get(m.to) ?? m.to }));
  const lines: string[] = [FORCES_CSV_COLUMNS.join(',')];
  const push = (source: string, name: string, m: (typeof members)[number], force: number, governing = '') => {
    const [value, sense] = forceCells(force);
    lines.push([source, name, m.tag, m.group, m.from, m.to, value, sense, governing].map(csvField).join(','));
  };
  for (const c of analysis.cases) for (const m of members) push('case', c.caseId, m, c.forces[m.id]);
  for (const c of analysis.combinations) for (const m of members) push('combination', c.name, m, c.forces[m.id]);
  const envelope = new Map(analysis.envelope.map((row) => [row.member, row]));
  for (const m of members) {
    const row = envelope.get(m.id);
    if (!row) continue;
    push('envelope', 'max tension', m, row.maxTension, row.maxTensionCombo ?? '');
    push('envelope', 'max compression', m, row.maxCompression, row.maxCompressionCombo ?? '');
    push('envelope', 'governing', m, row.governingForce, row.governing ?? '');
  }
  return lines.join('\r\n') + '\r\n';
}

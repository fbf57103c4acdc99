import { useMemo } from 'react';
import type { ColumnDef } from '@tanstack/react-table';
import type { UnitSystemId } from '@shared/units';
import { DataTable } from '@/components/ui/data-table';
import { forceDigits, forceSense, forceUnit, senseMark } from '../utils/force-format';
import { GROUP_LABELS } from '../utils/model-draft';
import type { ForceRow } from '../utils/run-results';

const SENSE_CLASS = { T: 'text-tension', C: 'text-compression', '0': 'text-ink-faint' } as const;

function Sense({ kN }: { kN: number }) {
  const s = forceSense(kN);
  return <span className={`font-medium ${SENSE_CLASS[s]}`}>{s === '0' ? '0' : senseMark(s)}</span>;
}

/** Member forces: sortable, numbers right-aligned with fixed decimals, (T)/(C) beside each. */
export function ForceTable({
  rows,
  envelope,
  unitSystem,
  utilisationOf,
}: {
  rows: ForceRow[];
  envelope: boolean;
  unitSystem: UnitSystemId;
  /** The member's design utilisation for the forces shown (a run with a member design). */
  utilisationOf?: (memberId: string) => { value: number; text: string } | null;
}) {
  const unit = forceUnit(unitSystem);
  const columns = useMemo<ColumnDef<ForceRow, any>[]>(() => {
    const withU = (cols: ColumnDef<ForceRow, any>[]): ColumnDef<ForceRow, any>[] =>
      utilisationOf
        ? [...cols, { id: 'utilisation', header: 'Utilisation', accessorFn: (r) => utilisationOf(r.id)?.value ?? 0, meta: { align: 'right' }, cell: (c) => utilisationOf(c.row.original.id)?.text ?? '—' }]
        : cols;
    const base: ColumnDef<ForceRow, any>[] = [
      { accessorKey: 'tag', header: 'Member', cell: (c) => <span className="font-medium text-ink">{c.getValue()}</span> },
      { accessorFn: (r) => (r.group ? GROUP_LABELS[r.group] : '—'), id: 'group', header: 'Group' },
      { accessorFn: (r) => `${r.from}–${r.to}`, id: 'joints', header: 'Joints', enableSorting: false },
      { accessorKey: 'length', header: 'Length, m', meta: { align: 'right' }, cell: (c) => (c.getValue() as number).toFixed(3) },
    ];
    if (!envelope) {
      return withU([
        ...base,
        { accessorKey: 'force', header: `Force, ${unit}`, meta: { align: 'right' }, cell: (c) => forceDigits(c.getValue(), unitSystem) },
        { id: 'sense', header: 'T / C', accessorFn: (r) => forceSense(r.force), cell: (c) => <Sense kN={c.row.original.force} />, meta: { align: 'right' } },
      ]);
    }
    return withU([
      ...base,
      { id: 'maxT', accessorFn: (r) => r.envelope?.maxTension ?? 0, header: `Max tension, ${unit}`, meta: { align: 'right' }, cell: (c) => forceDigits(c.getValue(), unitSystem) },
      { id: 'maxTBy', accessorFn: (r) => r.envelope?.maxTensionCombo ?? '—', header: 'from', cell: (c) => <span className="text-ink-soft">{c.getValue()}</span> },
      { id: 'maxC', accessorFn: (r) => r.envelope?.maxCompression ?? 0, header: `Max compression, ${unit}`, meta: { align: 'right' }, cell: (c) => forceDigits(c.getValue(), unitSystem) },
      { id: 'maxCBy', accessorFn: (r) => r.envelope?.maxCompressionCombo ?? '—', header: 'from', cell: (c) => <span className="text-ink-soft">{c.getValue()}</span> },
      { accessorKey: 'force', header: `Governing, ${unit}`, meta: { align: 'right' }, cell: (c) => <span className="font-medium">{forceDigits(c.getValue(), unitSystem)}</span> },
      { id: 'sense', header: 'T / C', accessorFn: (r) => forceSense(r.force), cell: (c) => <Sense kN={c.row.original.force} />, meta: { align: 'right' } },
      { id: 'governing', accessorFn: (r) => r.envelope?.governing ?? '—', header: 'Governed by' },
    ]);
  }, [envelope, unit, unitSystem, utilisationOf]);

  return (
    <DataTable
      data={rows}
      columns={columns}
      getRowId={(r) => r.id}
      empty="No members in this group. Assign member groups on the Model & loads tab to filter by chord and web."
    />
  );
}

import { useState, type ReactNode } from 'react';
import type { RevisionCompareView } from '@shared/schemas/revision-compare.schema';
import type { ValueChange } from '@shared/compare/revision-diff';
import { UNIT_SYSTEMS, unitFromBase } from '@shared/units';

const MINUS = '\u2212';
/** kN or m with fixed decimals and a true minus sign; '—' where a side has no value. */
export function fixed(v: number | null | undefined, decimals = 2, signed = false): string {
  if (v === null || v === undefined) return '—';
  const r = Math.abs(v) < 0.5 * 10 ** -decimals ? 0 : v;
  const text = Math.abs(r).toFixed(decimals);
  return r < 0 ? `${MINUS}${text}` : signed && r > 0 ? `+${text}` : text;
}

/** Rows shown before "Show all": a long truss's forces would push the sheet far down the page. */
const ROWS_SHOWN = 12;

function Table({ label, head, rows: all }: { label: string; head: string[]; rows: ReactNode[][] }) {
  const [open, setOpen] = useState(false);
  if (all.length === 0) return null;
  const rows = open ? all : all.slice(0, ROWS_SHOWN);
  return (
    <div className="overflow-x-auto border-y border-ink-soft bg-paper-raised">
      <table aria-label={label} className="w-full border-collapse text-[12.5px] leading-[18px] tabular-nums">
        <thead>
          <tr className="border-b border-ink-soft">
            {head.map((h, i) => (
              <th key={h} className={`px-2 py-1 text-[11px] font-semibold text-ink-soft ${i === 0 ? 'text-left' : 'text-right'}`}>
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((cells, r) => (
            <tr key={r} className="border-b border-paper-line last:border-b-0">
              {cells.map((c, i) => (
                <td key={i} className={`px-2 py-0.5 ${i === 0 ? 'text-left font-medium text-ink' : 'text-right text-ink'}`}>
                  {c}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {all.length > ROWS_SHOWN && (
        <button type="button" onClick={() => setOpen(!open)} className="w-full border-t border-paper-line px-2 py-1 text-left text-[11.5px] font-medium text-accent hover:underline">
          {open ? 'Show the largest only' : `Show all ${all.length} rows (the ${ROWS_SHOWN} largest differences are shown)`}
        </button>
      )}
    </div>
  );
}

/** Largest |difference| first; rows of a member or support found on one side only lead. */
const sizeOf = (v: ValueChange) => (v.difference === null ? Infinity : Math.abs(v.difference));
const byDifference = (a: ValueChange, b: ValueChange) => (sizeOf(a) === sizeOf(b) ? 0 : sizeOf(a) > sizeOf(b) ? -1 : 1);

function Group({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="flex flex-col gap-1.5">
      <h3 className="text-xs font-semibold text-ink">{title}</h3>
      {children}
    </div>
  );
}

/** The project's force and length units: the API's kN and m converted for a US project. */
function unitsOf(system: RevisionCompareView['unitSystem']) {
  const force = UNIT_SYSTEMS[system].force;
  const length = UNIT_SYSTEMS[system].length;
  const f = (v: number | null | undefined) => (v === null || v === undefined ? v : unitFromBase(v, force));
  const l = (v: number) => unitFromBase(v, length);
  return { force, length, f, l };
}

interface RevisionChangesProps {
  compare: RevisionCompareView;
  /** Other revisions of the truss this one can be compared with. */
  others: { id: number; label: string }[];
  withId: number | undefined;
  onWith: (id: number | undefined) => void;
  folded: boolean;
  onFolded: (folded: boolean) => void;
  onFocusStep: (anchor: string) => void;
}

/**
 * "Changes since revision A": one line per kind, then the tables of what changed (geometry,
 * supports, loads per case, combinations, member forces and reactions with their differences)
 * and the sheet's steps that changed, by the numbers the sheet prints.
 */
export function RevisionChanges({ compare, others, withId, onWith, folded, onFolded, onFocusStep }: RevisionChangesProps) {
  const { diff, steps, against } = compare;
  const u = unitsOf(compare.unitSystem ?? 'si');
  const at = (x: number, y: number) => `(${fixed(u.l(x), 3)}, ${fixed(u.l(y), 3)})`;
  const valueRow = (v: ValueChange) => [
    v.at,
    fixed(u.f(v.before)),
    fixed(u.f(v.after)),
    v.difference === null ? (v.before === null ? 'new' : 'gone') : fixed(u.f(v.difference), 2, true),
  ];
  const g = diff.geometry;
  const geometryRows: ReactNode[][] = [
    ...g.jointsMoved.map((j) => [`Joint ${j.tag}`, 'moved', at(j.before.x, j.before.y), at(j.after.x, j.after.y)]),
    ...g.jointsAdded.map((j) => [`Joint ${j.tag}`, 'added', '—', at(j.x, j.y)]),
    ...g.jointsRemoved.map((j) => [`Joint ${j.tag}`, 'removed', at(j.x, j.y), '—']),
    ...g.membersAdded.map((m) => [`Member ${m.tag}`, 'added', '—', `${m.from}–${m.to}`]),
    ...g.membersRemoved.map((m) => [`Member ${m.tag}`, 'removed', `${m.from}–${m.to}`, '—']),
    ...g.membersReconnected.map((m) => [`Member ${m.tag}`, 'reconnected', `${m.before.from}–${m.before.to}`, `${m.after.from}–${m.after.to}`]),
    ...g.memberProperties.map((p) => [`Member ${p.tag}`, p.field, String(p.before ?? '—'), String(p.after ?? '—')]),
  ];
  const supportText = (s: { kind: string; angleDeg?: number }) => (s.kind === 'roller' ? `roller ${s.angleDeg ?? 90}°` : 'pin');
  const supportRows: ReactNode[][] = [
    ...diff.supports.added.map((s) => [s.joint, '—', supportText(s)]),
    ...diff.supports.removed.map((s) => [s.joint, supportText(s), '—']),
    ...diff.supports.changed.map((s) => [s.joint, supportText(s.before), supportText(s.after)]),
  ];
  const loadRows: ReactNode[][] = [
    ...diff.loadCases.changed.flatMap((c) =>
      c.loads.map((l) => [
        `${c.id} · ${l.joint}`,
        `${fixed(u.f(l.before?.fx))} / ${fixed(u.f(l.before?.fy))}`,
        `${fixed(u.f(l.after?.fx))} / ${fixed(u.f(l.after?.fy))}`,
        `${fixed(u.f(l.dfx), 2, true)} / ${fixed(u.f(l.dfy), 2, true)}`,
      ]),
    ),
    ...diff.loadCases.added.map((c) => [`${c.id} (${c.name})`, 'new case', `${c.loadCount} loads, ΣFy ${fixed(u.f(c.totalFy))}`, '']),
    ...diff.loadCases.removed.map((c) => [`${c.id} (${c.name})`, `${c.loadCount} loads, ΣFy ${fixed(u.f(c.totalFy))}`, 'case removed', '']),
  ];
  const comboRows: ReactNode[][] = [
    ...diff.combinations.changed.flatMap((c) => c.factors.map((f) => [`${c.name} · ${f.caseId}`, fixed(f.before), fixed(f.after)])),
    ...diff.combinations.added.map((c) => [c.name, '—', 'added']),
    ...diff.combinations.removed.map((c) => [c.name, 'removed', '—']),
  ];
  const stepLabel = (s: { number: string | null; title: string; caseId: string }) => `${s.number ?? '—'} ${s.title}${s.caseId && !s.title.includes(`case ${s.caseId}`) ? ` (case ${s.caseId})` : ''}`;

  return (
    <section className="rounded-lg border border-accent/40 bg-paper-raised px-5 py-4" aria-label={`Changes since revision ${against.label}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 className="text-sm font-semibold text-ink">Changes since revision {against.label}</h2>
        <label className="flex items-center gap-2 text-xs text-ink-soft">
          Compare with
          <select
            aria-label="Compare with revision"
            className="rounded border border-paper-line bg-paper px-1.5 py-0.5 text-xs text-ink"
            value={withId ?? ''}
            onChange={(e) => onWith(e.target.value ? Number(e.target.value) : undefined)}
          >
            <option value="">the revision before</option>
            {others.map((o) => (
              <option key={o.id} value={o.id}>
                revision {o.label}
              </option>
            ))}
          </select>
        </label>
      </div>
      <p className="mt-0.5 text-xs text-ink-soft">
        Revision {against.label} ({against.run}, {against.status}, {against.date}) → revision {compare.revision.label} ({compare.revision.run}). Forces in {u.force}, coordinates in {u.length}; differences
        are this revision less revision {against.label}.
      </p>

      <ul className="mt-3 flex flex-col gap-0.5 text-[13px]" aria-label="What changed, by kind">
        {compare.lines.map((l) => (
          <li key={l.kind} className="flex gap-3">
            <span className="w-40 shrink-0 text-xs font-semibold leading-5 text-ink-soft">{l.label}</span>
            <span className={l.changed ? 'font-medium text-ink' : 'text-ink-faint'}>{l.text}</span>
          </li>
        ))}
      </ul>

      <div className="mt-4 flex flex-col gap-2 rounded-md border border-paper-line px-3 py-2.5" aria-label="Steps of the sheet">
        <div className="flex flex-wrap items-center justify-between gap-2">
          <p className="text-xs text-ink">
            <strong>{steps.changed.length}</strong> of {steps.total} worked steps changed or are new; {steps.unchanged.length} unchanged
            {steps.removed.length ? `; ${steps.removed.length} of revision ${against.label}'s steps are gone` : ''}.
          </p>
          <label className="flex items-center gap-1.5 text-xs text-ink-soft">
            <input type="checkbox" checked={folded} onChange={(e) => onFolded(e.target.checked)} />
            Fold unchanged steps on the sheet
          </label>
        </div>
        {steps.changed.length > 0 && (
          <ul className="flex flex-wrap gap-1.5" aria-label="Changed steps">
            {steps.changed.map((s) => (
              <li key={s.id}>
                <button
                  type="button"
                  onClick={() => onFocusStep(s.id)}
                  className="rounded border border-accent/50 bg-accent-soft px-1.5 py-0.5 text-[11.5px] font-medium text-ink hover:underline"
                  title={s.change === 'added' ? 'New step' : 'Changed step'}
                >
                  {stepLabel(s)}
                  {s.change === 'added' ? ' · new' : ''}
                </button>
              </li>
            ))}
          </ul>
        )}
        {steps.removed.length > 0 && (
          <p className="text-[11.5px] text-ink-soft">
            Gone since revision {against.label}: {steps.removed.map((s) => stepLabel(s)).join('; ')}.
          </p>
        )}
      </div>

      {!diff.unchanged && (
        <div className="mt-4 grid gap-4 xl:grid-cols-2">
          {geometryRows.length > 0 && (
            <Group title="Geometry">
              <Table label="Geometry changes" head={['Joint or member', 'Change', 'Before', 'After']} rows={geometryRows} />
            </Group>
          )}
          {supportRows.length > 0 && (
            <Group title="Supports">
              <Table label="Support changes" head={['Joint', 'Before', 'After']} rows={supportRows} />
            </Group>
          )}
          {loadRows.length > 0 && (
            <Group title="Loads per case">
              <Table label="Load changes" head={['Case · joint', `Before Fx / Fy, ${u.force}`, `After Fx / Fy, ${u.force}`, `Change, ${u.force}`]} rows={loadRows} />
            </Group>
          )}
          {comboRows.length > 0 && (
            <Group title="Combinations">
              <Table label="Combination changes" head={['Combination · case', 'Factor before', 'Factor after']} rows={comboRows} />
            </Group>
          )}
          {diff.results.map((r) => (
            <Group key={`${r.kind}-${r.name}`} title={`${r.kind === 'case' ? 'Load case' : 'Combination'} ${r.name}${r.presence === 'added' ? ' (new)' : r.presence === 'removed' ? ' (gone)' : ''}`}>
              <Table label={`Member forces, ${r.kind} ${r.name}`} head={['Member', `Before, ${u.force}`, `After, ${u.force}`, `Difference, ${u.force}`]} rows={[...r.forces].sort(byDifference).map(valueRow)} />
              <Table
                label={`Reactions, ${r.kind} ${r.name}`}
                head={['Support', `Before, ${u.force}`, `After, ${u.force}`, `Difference, ${u.force}`]}
                rows={r.reactions.map((v) => valueRow({ ...v, at: `${v.at} ${v.component === 'rx' ? 'Rx' : 'Ry'}` }))}
              />
            </Group>
          ))}
        </div>
      )}
      <p className="mt-3 text-[11px] text-ink-faint">{compare.toleranceNote}</p>
    </section>
  );
}

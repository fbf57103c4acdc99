import { useState } from 'react';
import { useFieldArray, useWatch } from 'react-hook-form';
import { memberGroupSchema, type Joint, type Member, type MemberGroup } from '@shared/model/truss';
import { Button } from '@/components/ui/button';
import { GROUP_LABELS } from '../utils/model-draft';
import { membersGroupByOutline } from '../utils/outline-groups';
import { fieldErrorText } from '../utils/field-error';
import type { DraftForm } from './draft-actions';
import { CELL_INPUT, TH, TH_RIGHT } from './supports-table';

interface MembersSectionProps {
  form: DraftForm;
  joints: readonly Joint[];
  /** Geometry of the members (tags and ends), in the same order as the draft's members. */
  members: readonly Member[];
  mayEdit: boolean;
  selected: ReadonlySet<string>;
  onSelect: (ids: Set<string>) => void;
}

const optionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));
const optionalText = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

/**
 * Member groups and properties (E, A or EA, material, section), per member or for every
 * selected member at once; members are selected here or by clicking them on the drawing.
 */
export function MembersSection({ form, joints, members, mayEdit, selected, onSelect }: MembersSectionProps) {
  const { fields } = useFieldArray({ control: form.control, name: 'members', keyName: 'key' });
  const drafts = useWatch({ control: form.control, name: 'members' }) ?? [];
  const byId = new Map(joints.map((j) => [j.id, j]));
  const geometry = new Map(members.map((m) => [m.id, m]));
  const [bulk, setBulk] = useState({ group: '', E: '', A: '', EA: '', material: '', section: '' });
  const errors = form.formState.errors.members;

  const selectGroup = (group: MemberGroup | 'all' | 'none') => {
    if (group === 'none') return onSelect(new Set());
    onSelect(new Set(drafts.filter((d) => group === 'all' || d.group === group).map((d) => d.id)));
  };

  const suggest = () => {
    const groups = membersGroupByOutline(joints, members);
    drafts.forEach((d, i) => {
      const g = groups.get(d.id);
      if (g) form.setValue(`members.${i}.group`, g, { shouldDirty: true });
    });
  };

  const applyBulk = () => {
    drafts.forEach((d, i) => {
      if (!selected.has(d.id)) return;
      const set = <K extends 'group' | 'E' | 'A' | 'EA' | 'material' | 'section'>(key: K, value: unknown) =>
        form.setValue(`members.${i}.${key}` as `members.${number}.${K}`, value as never, { shouldDirty: true });
      if (bulk.group) set('group', bulk.group);
      for (const key of ['E', 'A', 'EA'] as const) {
        const v = Number(bulk[key]);
        if (bulk[key].trim() !== '' && Number.isFinite(v)) set(key, v);
      }
      if (bulk.material.trim()) set('material', bulk.material.trim());
      if (bulk.section.trim()) set('section', bulk.section.trim());
    });
  };

  const counts = memberGroupSchema.options.map((g) => [g, drafts.filter((d) => d.group === g).length] as const);
  const ungrouped = drafts.filter((d) => !d.group).length;

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-2 text-xs text-ink-soft">
        <span className="font-semibold">Select</span>
        <Button size="sm" variant="quiet" onClick={() => selectGroup('all')}>
          All
        </Button>
        {(['top-chord', 'bottom-chord', 'web'] as const).map((g) => (
          <Button key={g} size="sm" variant="quiet" onClick={() => selectGroup(g)}>
            {GROUP_LABELS[g]}
          </Button>
        ))}
        <Button size="sm" variant="quiet" onClick={() => selectGroup('none')}>
          None
        </Button>
        <span className="ml-auto">
          {counts
            .filter(([, n]) => n > 0)
            .map(([g, n]) => `${n} ${GROUP_LABELS[g].toLowerCase()}`)
            .join(' · ') || 'No groups assigned yet'}
          {ungrouped > 0 && counts.some(([, n]) => n > 0) ? ` · ${ungrouped} without a group` : ''}
        </span>
        {mayEdit && (
          <Button size="sm" onClick={suggest} title="Members along the lower edge of the outline become bottom chord, along the upper edge top chord, the rest webs.">
            Suggest groups from the outline
          </Button>
        )}
      </div>

      {mayEdit && selected.size > 0 && (
        <div className="grid grid-cols-2 items-end gap-2 rounded-xs border border-accent/30 bg-accent-soft/50 px-3 py-2 text-xs sm:grid-cols-7">
          <span className="col-span-2 font-medium text-ink sm:col-span-7">
            {selected.size} member{selected.size === 1 ? '' : 's'} selected — set what you fill in:
          </span>
          <select aria-label="Group for the selected members" className={`${CELL_INPUT} border-paper-line`} value={bulk.group} onChange={(e) => setBulk({ ...bulk, group: e.target.value })}>
            <option value="">Group…</option>
            {memberGroupSchema.options.map((g) => (
              <option key={g} value={g}>
                {GROUP_LABELS[g]}
              </option>
            ))}
          </select>
          <input aria-label="E for the selected members, GPa" placeholder="E GPa" type="number" step="any" className={`${CELL_INPUT} border-paper-line text-right`} value={bulk.E} onChange={(e) => setBulk({ ...bulk, E: e.target.value })} />
          <input aria-label="A for the selected members, mm²" placeholder="A mm²" type="number" step="any" className={`${CELL_INPUT} border-paper-line text-right`} value={bulk.A} onChange={(e) => setBulk({ ...bulk, A: e.target.value })} />
          <input aria-label="EA for the selected members, kN" placeholder="EA kN" type="number" step="any" className={`${CELL_INPUT} border-paper-line text-right`} value={bulk.EA} onChange={(e) => setBulk({ ...bulk, EA: e.target.value })} />
          <input aria-label="Material for the selected members" placeholder="Material" className={`${CELL_INPUT} border-paper-line`} value={bulk.material} onChange={(e) => setBulk({ ...bulk, material: e.target.value })} />
          <input aria-label="Section for the selected members" placeholder="Section" className={`${CELL_INPUT} border-paper-line`} value={bulk.section} onChange={(e) => setBulk({ ...bulk, section: e.target.value })} />
          <Button size="sm" variant="primary" onClick={applyBulk}>
            Apply to selected
          </Button>
        </div>
      )}

      <div className="overflow-x-auto">
        <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
          <thead>
            <tr className="border-y border-ink-soft">
              <th className={`${TH} w-8`}>
                <span className="sr-only">Selected</span>
              </th>
              <th className={TH}>Member</th>
              <th className={TH_RIGHT}>Length, m</th>
              <th className={TH}>Group</th>
              <th className={TH_RIGHT}>E, GPa</th>
              <th className={TH_RIGHT}>A (mm²)</th>
              <th className={TH_RIGHT}>EA, kN</th>
              <th className={TH}>Material</th>
              <th className={TH}>Section</th>
            </tr>
          </thead>
          <tbody>
            {fields.map((field, i) => {
              const m = geometry.get(drafts[i]?.id ?? '');
              const a = m && byId.get(m.from);
              const b = m && byId.get(m.to);
              const length = a && b ? Math.hypot(b.x - a.x, b.y - a.y) : null;
              const id = drafts[i]?.id ?? '';
              const e = errors?.[i];
              const problems = [e?.E?.message, e?.A?.message, e?.EA?.message].map(fieldErrorText).filter(Boolean);
              return (
                <tr key={field.key} className={`border-b border-paper-line/70 align-top ${selected.has(id) ? 'bg-accent-soft/40' : ''}`}>
                  <td className="px-2 py-2">
                    <input
                      type="checkbox"
                      className="accent-accent"
                      aria-label={`Select member ${m?.tag ?? id}`}
                      checked={selected.has(id)}
                      onChange={() => {
                        const next = new Set(selected);
                        if (next.has(id)) next.delete(id);
                        else next.add(id);
                        onSelect(next);
                      }}
                    />
                  </td>
                  <td className="px-2 py-2 font-medium text-ink">
                    {m?.tag ?? id}
                    {problems.length > 0 && <p className="text-xs font-normal text-danger">{problems.join(' ')}</p>}
                  </td>
                  <td className="figures px-2 py-2 text-right text-ink-soft">{length === null ? '—' : length.toFixed(3)}</td>
                  <td className="w-36 px-2 py-1">
                    <select aria-label={`Member ${m?.tag}: group`} className={`${CELL_INPUT} border-paper-line`} {...form.register(`members.${i}.group`, { setValueAs: (v) => (v === '' ? undefined : v) })}>
                      <option value="">—</option>
                      {memberGroupSchema.options.map((g) => (
                        <option key={g} value={g}>
                          {GROUP_LABELS[g]}
                        </option>
                      ))}
                    </select>
                  </td>
                  {(['E', 'A', 'EA'] as const).map((key) => (
                    <td key={key} className="w-24 px-1 py-1">
                      <input
                        type="number"
                        step="any"
                        aria-label={`Member ${m?.tag}: ${key}`}
                        className={`${CELL_INPUT} ${e?.[key] ? 'border-danger' : 'border-paper-line'} text-right`}
                        {...form.register(`members.${i}.${key}`, { setValueAs: optionalNumber })}
                      />
                    </td>
                  ))}
                  <td className="px-1 py-1">
                    <input aria-label={`Member ${m?.tag}: material`} className={`${CELL_INPUT} border-paper-line`} {...form.register(`members.${i}.material`, { setValueAs: optionalText })} />
                  </td>
                  <td className="px-1 py-1">
                    <input aria-label={`Member ${m?.tag}: section`} className={`${CELL_INPUT} border-paper-line`} {...form.register(`members.${i}.section`, { setValueAs: optionalText })} />
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-ink-faint">
        E and A (or EA, which wins when both are given) are needed only for statically indeterminate trusses; material and section are printed on the calc sheet.
      </p>
    </div>
  );
}

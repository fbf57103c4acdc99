import { useState } from 'react';
import { STEEL_GRADES } from '@shared/design/materials';
import { COMMON_DEFLECTION_LIMITS } from '@shared/design/deflection';
import { areaIn, areaOut, DESIGN_UNITS, lengthIn, lengthOut, spanIn, spanOut, stressIn, stressOut, type DesignUnitSet } from '@shared/design/units';
import type { UnitSystemId } from '@shared/units';
import { designInputSchema, type DesignGroupInput, type DesignInput } from '@shared/model/design-input';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { errorMessage } from '@/lib/api-client';
import { useTrussModel } from '../api/get-model';
import { useSaveDesign } from '../api/save-design';

const FIELD = 'h-8 rounded-xs border border-paper-line bg-paper-raised px-2 text-[13px]';
const SHAPE_FIELDS: Record<DesignGroupInput['section']['shape'], string[]> = {
  properties: ['A', 'rx', 'ry'],
  rectangle: ['b', 'd'],
  'round-hollow': ['D', 't'],
  'rect-hollow': ['B', 'H', 't'],
  angle: ['b', 'd', 't'],
  'double-angle': ['b', 'd', 't', 's'],
};
const SHAPE_NAMES: Record<DesignGroupInput['section']['shape'], string> = {
  properties: 'By properties (A, rx, ry)',
  rectangle: 'Solid rectangle',
  'round-hollow': 'Round hollow',
  'rect-hollow': 'Rectangular hollow',
  angle: 'Single angle',
  'double-angle': 'Two angles back to back',
};
const STANDARDS: [DesignInput['standard'], string][] = [
  ['aisc360-16-lrfd', 'AISC 360-16 LRFD'],
  ['aisc360-16-asd', 'AISC 360-16 ASD'],
  ['en1993-1-1', 'EN 1993-1-1'],
  ['nds-2018-asd', 'NDS 2018 (ASD, timber)'],
];

const newGroup = (standard: DesignInput['standard'], n: number): DesignGroupInput => ({
  name: n === 0 ? 'All members' : `Group ${n + 1}`,
  members: n === 0 ? 'all' : 'web',
  material: standard === 'nds-2018-asd' ? { kind: 'timber', Ft: 0, Fc: 0, Emin: 0, E: 0, c: 0.8 } : { kind: 'grade', grade: standard === 'en1993-1-1' ? 'S355' : 'A992' },
  section: { shape: 'rect-hollow', B: 80, H: 80, t: 4 },
});

/** The "Member design" tab: design basis, groups with material and section, deflection request. */
export function DesignWorkspace({ trussId, mayEdit, unitSystem = 'si' }: { trussId: number; mayEdit: boolean; unitSystem?: UnitSystemId }) {
  const model = useTrussModel(trussId);
  if (model.isPending) return <LoadingState label="Loading the model…" />;
  if (model.isError) return <ErrorState title="The model could not be loaded" error={model.error} onRetry={() => void model.refetch()} />;
  return <DesignEditor key={`${model.data.version}-${unitSystem}`} view={model.data} mayEdit={mayEdit} u={DESIGN_UNITS[unitSystem]} />;
}

/**
 * Values are stored in SI (MPa, mm, mm², m) whatever the project's units; a US customary project
 * enters and sees them in ksi, in, in² and ft, converted here at the edge (shared/design/units).
 */
function DesignEditor({ view, mayEdit, u }: { view: TrussModelView; mayEdit: boolean; u: DesignUnitSet }) {
  const section = (f: string) => (f === 'A' || f === 'An' ? { out: (v: number) => areaOut(v, u), in: (v: number) => areaIn(v, u), unit: u.area } : { out: (v: number) => lengthOut(v, u), in: (v: number) => lengthIn(v, u), unit: u.length });
  const save = useSaveDesign();
  const [draft, setDraft] = useState<DesignInput>(view.model.design ?? { standard: 'aisc360-16-lrfd', groups: [newGroup('aisc360-16-lrfd', 0)] });
  const [error, setError] = useState<string | null>(null);
  const tagToId = new Map(view.model.members.map((m) => [m.tag, m.id]));
  const idToTag = new Map(view.model.members.map((m) => [m.id, m.tag]));
  const jointTag = new Map(view.model.joints.map((j) => [j.id, j.tag]));
  const jointId = new Map(view.model.joints.map((j) => [j.tag, j.id]));
  const setGroup = (i: number, g: DesignGroupInput) => setDraft({ ...draft, groups: draft.groups.map((x, k) => (k === i ? g : x)) });

  const onSave = async () => {
    setError(null);
    const parsed = designInputSchema.safeParse(draft);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      setError(issue.message);
      return;
    }
    try {
      await save.mutateAsync({ trussId: view.trussId, input: { version: view.version, design: parsed.data } });
    } catch (e) {
      setError(errorMessage(e));
    }
  };

  if (!view.model.members.length) return <EmptyState>The truss has no members yet.</EmptyState>;
  return (
    <Panel title="Member design">
      <fieldset disabled={!mayEdit} className="flex flex-col gap-4">
        <label className="flex items-center gap-2 text-sm">
          Design basis
          <select aria-label="Design basis" className={FIELD} value={draft.standard} onChange={(e) => setDraft({ ...draft, standard: e.target.value as DesignInput['standard'] })}>
            {STANDARDS.map(([v, l]) => (
              <option key={v} value={v}>
                {l}
              </option>
            ))}
          </select>
          <span className="text-xs text-ink-faint">Later groups take their members from earlier ones.</span>
        </label>
        {draft.groups.map((g, i) => (
          <div key={i} className="rounded-xs border border-paper-line p-3" aria-label={`Design group ${i + 1}`}>
            <div className="flex flex-wrap items-center gap-3">
              <input aria-label="Group name" className={FIELD} value={g.name} onChange={(e) => setGroup(i, { ...g, name: e.target.value })} />
              <select
                aria-label="Members of the group"
                className={FIELD}
                value={Array.isArray(g.members) ? 'chosen' : g.members}
                onChange={(e) => setGroup(i, { ...g, members: e.target.value === 'chosen' ? [view.model.members[0].id] : (e.target.value as 'all') })}
              >
                <option value="all">All members</option>
                <option value="top-chord">Top chord</option>
                <option value="bottom-chord">Bottom chord</option>
                <option value="web">Webs</option>
                <option value="chosen">Chosen members…</option>
              </select>
              {Array.isArray(g.members) && (
                <input
                  aria-label="Member labels"
                  className={`${FIELD} w-56`}
                  defaultValue={g.members.map((id) => idToTag.get(id) ?? id).join(', ')}
                  onBlur={(e) => setGroup(i, { ...g, members: e.target.value.split(/[\s,]+/).filter(Boolean).map((t) => tagToId.get(t) ?? t) })}
                  placeholder="Member labels, comma separated"
                />
              )}
              {draft.groups.length > 1 && (
                <Button size="sm" variant="quiet" onClick={() => setDraft({ ...draft, groups: draft.groups.filter((_, k) => k !== i) })}>
                  Remove group
                </Button>
              )}
            </div>
            <div className="mt-3 flex flex-wrap items-center gap-3 text-sm">
              {draft.standard === 'nds-2018-asd' ? (
                (['Ft', 'Fc', 'Emin', 'E', 'c'] as const).map((k) => (
                  <label key={k} className="flex items-center gap-1">
                    {k}
                    {k === 'c' ? '' : ` (${u.stress})`}
                    <NumberField
                      label={`Timber ${k}`}
                      value={g.material.kind === 'timber' ? (k === 'c' ? g.material[k] : stressOut(g.material[k], u)) : 0}
                      onChange={(v) => setGroup(i, { ...g, material: { ...(g.material.kind === 'timber' ? g.material : { kind: 'timber', Ft: 0, Fc: 0, Emin: 0, E: 0, c: 0.8 }), [k]: v === null || k === 'c' ? v : stressIn(v, u) } })}
                    />
                  </label>
                ))
              ) : (
                <>
                  <select
                    aria-label="Steel"
                    className={FIELD}
                    value={g.material.kind === 'grade' ? g.material.grade : 'values'}
                    onChange={(e) => setGroup(i, { ...g, material: e.target.value === 'values' ? { kind: 'steel', Fy: STEEL_GRADES.A992.Fy, Fu: STEEL_GRADES.A992.Fu, E: STEEL_GRADES.A992.E } : { kind: 'grade', grade: e.target.value } })}
                  >
                    {Object.entries(STEEL_GRADES).map(([k, m]) => (
                      <option key={k} value={k} title={m.source}>
                        {m.grade}
                      </option>
                    ))}
                    <option value="values">Fy, Fu, E entered</option>
                  </select>
                  {g.material.kind === 'steel' &&
                    (['Fy', 'Fu', 'E'] as const).map((k) => (
                      <label key={k} className="flex items-center gap-1">
                        {k} ({u.stress})
                        <NumberField label={`Steel ${k}`} value={g.material.kind === 'steel' ? stressOut(g.material[k], u) : 0} onChange={(v) => g.material.kind === 'steel' && setGroup(i, { ...g, material: { ...g.material, [k]: v === null ? v : stressIn(v, u) } })} />
                      </label>
                    ))}
                  {g.material.kind === 'grade' && <span className="text-xs text-ink-faint">{STEEL_GRADES[g.material.grade]?.source}</span>}
                </>
              )}
            </div>
            <div className="mt-3 flex flex-wrap items-center gap-3 text-sm">
              <select
                aria-label="Section shape"
                className={FIELD}
                value={g.section.shape}
                onChange={(e) => {
                  const shape = e.target.value as DesignGroupInput['section']['shape'];
                  setGroup(i, { ...g, section: Object.fromEntries([['shape', shape], ...SHAPE_FIELDS[shape].map((f) => [f, f === 's' ? 10 : 50])]) as DesignGroupInput['section'] }); // mm, mm²
                }}
              >
                {Object.entries(SHAPE_NAMES).map(([k, l]) => (
                  <option key={k} value={k}>
                    {l}
                  </option>
                ))}
              </select>
              {SHAPE_FIELDS[g.section.shape].map((f) => (
                <label key={f} className="flex items-center gap-1">
                  {f} ({section(f).unit})
                  <NumberField
                    label={`Section ${f}`}
                    value={section(f).out((g.section as unknown as Record<string, number>)[f] ?? 0)}
                    onChange={(v) => setGroup(i, { ...g, section: { ...g.section, [f]: v === null ? v : section(f).in(v) } as DesignGroupInput['section'] })}
                  />
                </label>
              ))}
              <label className="flex items-center gap-1">
                K
                <NumberField label="K" value={g.Kx ?? 1} onChange={(v) => setGroup(i, { ...g, Kx: v ?? undefined, Ky: v ?? undefined })} />
              </label>
              <label className="flex items-center gap-1" title="Out-of-plane unbraced length: purlin or brace spacing; empty for the member length">
                Ly ({u.span})
                <NumberField label="Out-of-plane length Ly" value={g.Ly === undefined ? null : spanOut(g.Ly, u)} onChange={(v) => setGroup(i, { ...g, Ly: v === null ? undefined : spanIn(v, u) })} optional />
              </label>
            </div>
          </div>
        ))}
        <div className="flex flex-wrap items-center gap-3 text-sm">
          <Button size="sm" onClick={() => setDraft({ ...draft, groups: [...draft.groups, newGroup(draft.standard, draft.groups.length)] })}>
            Add a group
          </Button>
        </div>
        <div className="flex flex-wrap items-center gap-3 text-sm" aria-label="Deflection">
          Deflection at joints
          <input
            aria-label="Deflection joints"
            className={`${FIELD} w-40`}
            defaultValue={draft.deflection?.joints.map((j) => jointTag.get(j) ?? j).join(', ') ?? ''}
            placeholder="Joint labels"
            onBlur={(e) => {
              const joints = e.target.value.split(/[\s,]+/).filter(Boolean).map((t) => jointId.get(t) ?? t);
              const { deflection, ...rest } = draft;
              setDraft(joints.length ? { ...rest, deflection: { combinations: deflection?.combinations ?? [view.model.loadCases[0]?.id ?? ''], limit: deflection?.limit ?? 240, joints } } : rest);
            }}
          />
          {draft.deflection && (
            <>
              under
              <select
                aria-label="Service combination"
                className={FIELD}
                value={draft.deflection.combinations[0]}
                onChange={(e) => setDraft({ ...draft, deflection: { ...draft.deflection!, combinations: [e.target.value] } })}
              >
                {[...view.model.loadCases.map((c) => c.id), ...view.model.combinations.map((c) => c.name)].map((n) => (
                  <option key={n}>{n}</option>
                ))}
              </select>
              limit span /
              <select aria-label="Deflection limit" className={FIELD} value={draft.deflection.limit} onChange={(e) => setDraft({ ...draft, deflection: { ...draft.deflection!, limit: Number(e.target.value) } })}>
                {COMMON_DEFLECTION_LIMITS.map((l) => (
                  <option key={l.limit} value={l.limit} title={l.note}>
                    {l.limit}
                  </option>
                ))}
              </select>
              <span className="text-xs text-ink-faint">Limits offered are common practice, no source; the engineer sets the one that applies.</span>
            </>
          )}
        </div>
        {error && (
          <p role="alert" className="text-sm text-danger">
            {error}
          </p>
        )}
        {mayEdit && (
          <div>
            <Button variant="primary" busy={save.isPending} onClick={() => void onSave()}>
              Save member design
            </Button>
          </div>
        )}
        <p className="text-xs text-ink-faint">
          Design values, the standard’s edition and the National Annex must be verified by the engineer of record. A pair of angles in compression is not checked (AISC 360-16 E6 and EN 1993-1-1 6.4 are not applied).
        </p>
      </fieldset>
    </Panel>
  );
}

function NumberField({ label, value, onChange, optional = false }: { label: string; value: number | null; onChange: (v: number | null) => void; optional?: boolean }) {
  return (
    <input
      aria-label={label}
      className={`${FIELD} w-24 text-right`}
      inputMode="decimal"
      defaultValue={value === null ? '' : String(Number(value.toPrecision(6)))}
      onBlur={(e) => {
        const t = e.target.value.trim();
        // Left as shown: keep the stored value (the field shows it to 6 figures in the project's units).
        if (t === e.target.defaultValue) return;
        if (t === '' && optional) return onChange(null);
        onChange(Number(t));
      }}
    />
  );
}

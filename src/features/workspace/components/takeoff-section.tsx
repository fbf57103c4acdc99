import { useEffect, useMemo, useState } from 'react';
import { useFieldArray, useWatch, type UseFormReturn } from 'react-hook-form';
import type { z } from 'zod';
import { loadCategorySchema, type Joint, type LoadCategory } from '@shared/model/truss';
import { takeoffInputSchema, type TakeoffInput } from '@shared/schemas/run.schema';
import { PATTERN_CATEGORIES, type RoofTakeoffResult } from '@shared/takeoff';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/api-client';
import { useTakeoffPreview } from '../api/preview-takeoff';
import { CATEGORY_LABELS } from '../utils/model-draft';
import { draftActions, type DraftForm } from './draft-actions';
import { CELL_INPUT, TH, TH_RIGHT } from './supports-table';
import { TakeoffPreview } from './takeoff-preview';

export type TakeoffFormValues = z.input<typeof takeoffInputSchema>;
export type TakeoffForm = UseFormReturn<TakeoffFormValues>;

interface TakeoffSectionProps {
  trussId: number;
  form: DraftForm;
  takeoffForm: TakeoffForm;
  /** Top-chord joints in order of x (from the members grouped as top chord). */
  topChord: readonly Joint[];
  mayEdit: boolean;
  busy: boolean;
  onUse: (input: TakeoffInput, result: RoofTakeoffResult) => void;
  onRemove: () => void;
  hasSaved: boolean;
  /** The truss's load letter (loadLetterOf in @shared/solver), as the calc sheet writes its loads. */
  loadLetter: string;
}

/** Reads "4.5" as one spacing and "4.5, 4.5, 6" as the spacings in order; m. */
export function spacingParse(text: unknown): number | number[] {
  if (typeof text === 'number' || Array.isArray(text)) return text as number | number[];
  const parts = String(text ?? '')
    .split(/[,;\s]+/)
    .filter(Boolean)
    .map(Number);
  if (parts.length === 0) return Number.NaN;
  return parts.length === 1 ? parts[0]! : parts;
}

const spacingText = (v: unknown) => (Array.isArray(v) ? v.join(', ') : v === undefined || Number.isNaN(v) ? '' : String(v));

/** The takeoff input the form describes, with the top chord and purlins filled in from the drawing. */
export function takeoffCandidate(values: TakeoffFormValues, topChord: readonly Joint[]) {
  const top = topChord.map((j) => j.id);
  const x = new Map(topChord.map((j) => [j.id, j.x]));
  const purlins = (values.purlinJoints ?? top).filter((id) => x.has(id)).sort((a, b) => x.get(a)! - x.get(b)!);
  // An empty number field reads as NaN: for the wind that means "not given".
  const given = (v: unknown) => (typeof v === 'number' && Number.isNaN(v) ? null : v);
  const wind = values.wind ? { ...values.wind, q: given(values.wind.q), cWindward: given(values.wind.cWindward), cLeeward: given(values.wind.cLeeward) } : values.wind;
  return takeoffInputSchema.safeParse({ ...values, wind, spacing: spacingParse(values.spacing), topChordJoints: top, purlinJoints: purlins });
}

function useDebounced<T>(value: T, ms: number): T {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setV(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return v;
}

/**
 * The roof loading as a guided form: area loads per case, purlins on the top-chord joints
 * (picked on the drawing above), truss spacing, count and which truss, and the method; the
 * server's preview shows every purlin's numbers, and "Use these loads" writes the cases.
 */
export function TakeoffSection({ trussId, form, takeoffForm, topChord, mayEdit, busy, onUse, onRemove, hasSaved, loadLetter }: TakeoffSectionProps) {
  const actions = draftActions(form);
  const cases = useWatch({ control: form.control, name: 'loadCases' }) ?? [];
  const values = useWatch({ control: takeoffForm.control }) as TakeoffFormValues;
  const { fields, append, remove } = useFieldArray({ control: takeoffForm.control, name: 'areaLoads' });
  const candidate = useMemo(() => takeoffCandidate(values, topChord), [values, topChord]);
  const ready = candidate.success ? candidate.data : null;
  const debounced = useDebounced(ready, 350);
  const preview = useTakeoffPreview(trussId, debounced);
  const fresh = preview.data && ready && JSON.stringify(preview.data.input) === JSON.stringify(ready) ? preview.data : null;
  const caseNames = new Map(cases.map((c) => [c.id, c.name]));
  const count = Number(values.trussCount);
  const problems = candidate.success ? [] : [...new Set(candidate.error.issues.map((i) => i.message))];

  const categoryOf = (id: string | undefined) => cases.find((c) => c.id === id)?.category;
  const patternable = (id: string | undefined) => {
    const category = categoryOf(id);
    return category !== undefined && PATTERN_CATEGORIES.includes(category);
  };
  const chooseCase = (i: number, value: string) => {
    const category = value.startsWith('new:') ? (value.slice(4) as LoadCategory) : categoryOf(value);
    const id = value.startsWith('new:') ? actions.addCase(value.slice(4) as LoadCategory, `${CATEGORY_LABELS[value.slice(4) as LoadCategory]} (roof loading)`) : value;
    takeoffForm.setValue(`areaLoads.${i}.caseId`, id, { shouldDirty: true });
    // Span patterns are for live, roof live and snow only: leave none ticked on another case.
    if (!category || !PATTERN_CATEGORIES.includes(category)) takeoffForm.setValue(`areaLoads.${i}.patterns`, false, { shouldDirty: true });
  };
  const wind = values.wind ?? null;
  const windCases = cases.filter((c) => c.category === 'wind');
  const toggleWind = (on: boolean) =>
    takeoffForm.setValue(
      'wind',
      on ? { caseId: windCases[0]?.id ?? '', q: Number.NaN, unit: 'kPa', windward: 'left', cWindward: Number.NaN, cLeeward: Number.NaN } : null,
      { shouldDirty: true },
    );
  const chooseWindCase = (value: string) => {
    const id = value === 'new:wind' ? actions.addCase('wind', 'Wind (roof loading)') : value;
    takeoffForm.setValue('wind.caseId', id, { shouldDirty: true });
  };

  if (topChord.length < 2) {
    return (
      <div className="rounded-xs border border-dashed border-paper-line px-4 py-6 text-sm text-ink-soft">
        The roof loading puts purlins on top-chord joints, and no members are grouped as top chord yet. Open <strong>Members</strong> and use
        “Suggest groups from the outline”, or select the top-chord members and set their group.
      </div>
    );
  }

  return (
    <div className="flex flex-col gap-5">
      <fieldset disabled={!mayEdit} className="flex flex-col gap-5">
        <div>
          <h3 className="mb-1 text-sm font-semibold text-ink">1. Area loads</h3>
          <p className="mb-2 text-xs text-ink-faint">Vertical, downward positive. Each writes the joint loads of one load case.</p>
          <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
            <thead>
              <tr className="border-y border-ink-soft">
                <th className={TH}>Load case</th>
                <th className={TH_RIGHT}>q</th>
                <th className={TH}>Unit</th>
                <th className={TH}>Acting on</th>
                <th className={TH} title="ASCE/SEI 7-16 4.3.3 and 7.5: the purlin reaction from the pattern of loaded and unloaded spans that gives this truss the most">
                  Unfavourable span patterns
                </th>
                <th className={TH}>
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {fields.length === 0 && (
                <tr>
                  <td colSpan={6} className="px-2 py-3 text-center text-sm text-ink-soft">
                    No area loads yet.
                  </td>
                </tr>
              )}
              {fields.map((field, i) => (
                <tr key={field.id} className="border-b border-paper-line/70">
                  <td className="px-2 py-1">
                    <select
                      aria-label={`Area load ${i + 1}: load case`}
                      className={`${CELL_INPUT} border-paper-line`}
                      value={values.areaLoads?.[i]?.caseId ?? ''}
                      onChange={(e) => chooseCase(i, e.target.value)}
                    >
                      <option value="">Choose…</option>
                      {cases.map((c) => (
                        <option key={c.id} value={c.id}>
                          {c.id} — {c.name}
                        </option>
                      ))}
                      {loadCategorySchema.options
                        .filter((c) => c !== 'wind')
                        .map((cat) => (
                          <option key={cat} value={`new:${cat}`}>
                            + New {CATEGORY_LABELS[cat].toLowerCase()} case
                          </option>
                        ))}
                    </select>
                  </td>
                  <td className="w-28 px-2 py-1">
                    <input type="number" step="any" aria-label={`Area load ${i + 1}: q`} className={`${CELL_INPUT} border-paper-line text-right`} {...takeoffForm.register(`areaLoads.${i}.q`, { valueAsNumber: true })} />
                  </td>
                  <td className="w-24 px-2 py-1">
                    <select aria-label={`Area load ${i + 1}: unit`} className={`${CELL_INPUT} border-paper-line`} {...takeoffForm.register(`areaLoads.${i}.unit`)}>
                      <option value="kPa">kPa</option>
                      <option value="psf">psf</option>
                    </select>
                  </td>
                  <td className="w-56 px-2 py-1">
                    <select aria-label={`Area load ${i + 1}: basis`} className={`${CELL_INPUT} border-paper-line`} {...takeoffForm.register(`areaLoads.${i}.basis`)}>
                      <option value="slope">the sloped roof area</option>
                      <option value="plan">the horizontal projection</option>
                    </select>
                  </td>
                  <td className="px-2 py-1">
                    <label className="flex items-center gap-2 text-xs text-ink-soft">
                      <input
                        type="checkbox"
                        className="accent-accent"
                        aria-label={`Area load ${i + 1}: check unfavourable span patterns`}
                        disabled={!patternable(values.areaLoads?.[i]?.caseId)}
                        title={patternable(values.areaLoads?.[i]?.caseId) ? undefined : 'For roof live, live and snow cases only'}
                        {...takeoffForm.register(`areaLoads.${i}.patterns`)}
                      />
                      check
                    </label>
                  </td>
                  <td className="w-16 px-2 py-1 text-right">
                    <button type="button" className="text-xs text-danger hover:underline" onClick={() => remove(i)}>
                      Remove
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <Button size="sm" className="mt-2" onClick={() => append({ caseId: '', q: Number.NaN, unit: 'kPa', basis: 'slope' })}>
            Add area load
          </Button>
          <p className="mt-1 text-xs text-ink-faint">
            Span patterns (roof live, live and snow): each purlin's reaction on this truss is taken from the pattern of loaded and empty purlin spans that
            gives it the most (ASCE/SEI 7-16 4.3.3 partial loading, 7.5 partial snow loading); the preview names the pattern.
          </p>
        </div>

        <div>
          <h3 className="mb-1 text-sm font-semibold text-ink">Wind normal to the roof</h3>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" className="accent-accent" checked={Boolean(wind)} onChange={(e) => toggleWind(e.target.checked)} />
            Wind on the roof slopes
          </label>
          <p className="mb-2 text-xs text-ink-faint">
            Velocity pressure q times each slope's pressure coefficient (positive: pressure towards the roof; negative: suction), on the sloped area and
            normal to it; each purlin's load is resolved into x and y. The slope left of the ridge is the one rising to the right.
          </p>
          {wind && (
            <div className="grid grid-cols-1 gap-3 sm:grid-cols-6">
              <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft sm:col-span-2">
                Wind load case
                <select aria-label="Wind: load case" className={`${CELL_INPUT} border-paper-line h-9 font-normal`} value={wind.caseId ?? ''} onChange={(e) => chooseWindCase(e.target.value)}>
                  <option value="">Choose…</option>
                  {windCases.map((c) => (
                    <option key={c.id} value={c.id}>
                      {c.id} — {c.name}
                    </option>
                  ))}
                  <option value="new:wind">+ New wind case</option>
                </select>
              </label>
              <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft">
                q
                <input type="number" step="any" aria-label="Wind: velocity pressure q" className={`${CELL_INPUT} border-paper-line h-9 text-right`} {...takeoffForm.register('wind.q', { valueAsNumber: true })} />
              </label>
              <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft">
                Unit
                <select aria-label="Wind: unit" className={`${CELL_INPUT} border-paper-line h-9 font-normal`} {...takeoffForm.register('wind.unit')}>
                  <option value="kPa">kPa</option>
                  <option value="psf">psf</option>
                </select>
              </label>
              <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft sm:col-span-2">
                Wind blows onto
                <select aria-label="Wind: windward slope" className={`${CELL_INPUT} border-paper-line h-9 font-normal`} {...takeoffForm.register('wind.windward')}>
                  <option value="left">the slope left of the ridge</option>
                  <option value="right">the slope right of the ridge</option>
                </select>
              </label>
              <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft sm:col-span-3">
                Windward coefficient
                <input type="number" step="any" aria-label="Wind: windward coefficient" className={`${CELL_INPUT} border-paper-line h-9 text-right`} {...takeoffForm.register('wind.cWindward', { valueAsNumber: true })} />
              </label>
              <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft sm:col-span-3">
                Leeward coefficient
                <input type="number" step="any" aria-label="Wind: leeward coefficient" className={`${CELL_INPUT} border-paper-line h-9 text-right`} {...takeoffForm.register('wind.cLeeward', { valueAsNumber: true })} />
              </label>
            </div>
          )}
        </div>

        <div>
          <h3 className="mb-1 text-sm font-semibold text-ink">2. Purlins</h3>
          <p className="text-xs text-ink-soft">
            Click top-chord joints on the drawing to put or take away a purlin. Now on:{' '}
            <span className="font-medium text-ink">
              {(candidate.success ? candidate.data.purlinJoints ?? [] : (values.purlinJoints ?? topChord.map((j) => j.id)))
                .map((id) => topChord.find((j) => j.id === id)?.tag ?? id)
                .join(', ') || 'none'}
            </span>
            .{' '}
            <button type="button" className="text-accent hover:underline" onClick={() => takeoffForm.setValue('purlinJoints', undefined, { shouldDirty: true })}>
              Every top-chord joint
            </button>
          </p>
        </div>

        <div>
          <h3 className="mb-2 text-sm font-semibold text-ink">3. Trusses the purlins run over</h3>
          <div className="grid grid-cols-1 gap-3 sm:grid-cols-4">
            <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft">
              Spacing (m)
              <input
                aria-label="Truss spacing, m"
                className={`${CELL_INPUT} border-paper-line h-9 font-normal`}
                placeholder="4.5  or  4.5, 4.5, 6"
                defaultValue={spacingText(takeoffForm.getValues('spacing'))}
                onChange={(e) => takeoffForm.setValue('spacing', spacingParse(e.target.value), { shouldDirty: true })}
              />
              <span className="font-normal tracking-normal text-ink-faint normal-case">One value, or every spacing in order.</span>
            </label>
            <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft">
              Number of trusses
              <input type="number" min={2} step={1} aria-label="Number of trusses" className={`${CELL_INPUT} border-paper-line h-9 text-right`} {...takeoffForm.register('trussCount', { valueAsNumber: true })} />
            </label>
            <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft">
              This truss
              <select aria-label="Which truss" className={`${CELL_INPUT} border-paper-line h-9 font-normal`} {...takeoffForm.register('trussIndex', { valueAsNumber: true })}>
                {Array.from({ length: Number.isInteger(count) && count >= 2 ? Math.min(count, 1001) : 2 }, (_, i) => (
                  <option key={i} value={i}>
                    No. {i + 1} from the end — {i === 0 || i === count - 1 ? 'end truss' : 'interior'}
                  </option>
                ))}
              </select>
            </label>
            <fieldset className="flex flex-col gap-1">
              <legend className="mb-1 text-xs font-semibold text-ink-soft">Joint loads from</legend>
              <label className="flex items-center gap-2 text-sm">
                <input type="radio" value="exact" className="accent-accent" {...takeoffForm.register('method')} />
                continuous purlin (three-moment equation)
              </label>
              <label className="flex items-center gap-2 text-sm">
                <input type="radio" value="tributary" className="accent-accent" {...takeoffForm.register('method')} />
                tributary length
              </label>
            </fieldset>
          </div>
        </div>
      </fieldset>

      <div className="rounded-xs border border-paper-line bg-paper-raised px-4 py-3">
        <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
          <h3 className="text-sm font-semibold text-ink">Preview</h3>
          <div className="flex items-center gap-2">
            {preview.isFetching && <span className="text-xs text-ink-faint">Computing…</span>}
            {mayEdit && hasSaved && (
              <Button size="sm" variant="danger" onClick={onRemove} disabled={busy}>
                Remove the roof loading
              </Button>
            )}
            {mayEdit && (
              <Button size="sm" variant="primary" busy={busy} disabled={!fresh} onClick={() => fresh && onUse(fresh.input, fresh.result)}>
                Use these loads
              </Button>
            )}
          </div>
        </div>
        {problems.length > 0 ? (
          <ul className="list-disc pl-5 text-sm text-ink-soft">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        ) : preview.isError && !preview.isFetching ? (
          <p role="alert" className="text-sm text-danger">
            {errorMessage(preview.error)}
          </p>
        ) : fresh || preview.data ? (
          <div className={fresh ? '' : 'opacity-60'}>
            <TakeoffPreview result={(fresh ?? preview.data)!.result} caseNames={caseNames} loadLetter={loadLetter} />
          </div>
        ) : (
          <p className="text-sm text-ink-soft">Working out the roof loading…</p>
        )}
      </div>
    </div>
  );
}

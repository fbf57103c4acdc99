import { useState, type FormEvent } from 'react';
import { dxfLengthUnitSchema, type DxfLengthUnit } from '@shared/dxf-import';
import type { DrawingView, ReimportInput } from '@shared/schemas/drawing.schema';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { useReimportDrawing } from '../api/reimport-drawing';
import { DRAWING_UNIT_LABELS, formatTolerance, insunitsName, parseTolerance, toleranceInUnit, type ToleranceUnit } from '../utils/units';

/** What the drawing itself says about its units, as far as the last import tells. */
export function drawingOwnUnits(drawing: DrawingView): { unitless: boolean; words: string | null } {
  if (drawing.result) {
    const { units } = drawing.result;
    if (units.insunits === 0) return { unitless: true, words: insunitsName(0) };
    return { unitless: false, words: units.source === 'drawing' ? units.name : insunitsName(units.insunits) };
  }
  if (drawing.error?.code === 'units-required') return { unitless: true, words: insunitsName(0) };
  return { unitless: false, words: null };
}

function defaultLayers(drawing: DrawingView): string[] {
  return drawing.options.layers ?? drawing.result?.layers ?? drawing.layers.filter((l) => l.holdsLines).map((l) => l.name);
}

interface ReimportFormProps {
  drawing: DrawingView;
  toleranceUnit: ToleranceUnit;
  onReimported: (drawing: DrawingView) => void;
}

/** Layers, units and tolerance for importing a stored version again, without uploading it again. */
export function ReimportForm({ drawing, toleranceUnit, onReimported }: ReimportFormProps) {
  const own = drawingOwnUnits(drawing);
  const lineLayers = drawing.layers.filter((l) => l.holdsLines);
  const [layers, setLayers] = useState<Set<string>>(() => new Set(defaultLayers(drawing)));
  const [units, setUnits] = useState<DxfLengthUnit | ''>(drawing.options.units ?? '');
  const [tolerance, setTolerance] = useState(
    drawing.options.tolerance !== undefined ? String(toleranceInUnit(drawing.options.tolerance, toleranceUnit)) : '',
  );
  const [errors, setErrors] = useState<{ layers?: string; units?: string; tolerance?: string }>({});
  const reimport = useReimportDrawing();

  const toggleLayer = (name: string) =>
    setLayers((now) => {
      const next = new Set(now);
      if (next.has(name)) next.delete(name);
      else next.add(name);
      return next;
    });

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const found: typeof errors = {};
    if (layers.size === 0) found.layers = 'Tick at least one layer to take members from.';
    if (own.unitless && !units) found.units = 'This drawing has no units of its own: choose the units it was drawn in.';
    const metres = parseTolerance(tolerance, toleranceUnit);
    if (Number.isNaN(metres)) found.tolerance = `Write the tolerance as a number above 0, in ${toleranceUnit.symbol}, or leave it empty for the default.`;
    setErrors(found);
    if (Object.keys(found).length) return;
    // Keep the file's layer order, so the request reads like the layer list.
    const input: ReimportInput = { layers: drawing.layers.map((l) => l.name).filter((n) => layers.has(n)) };
    if (units) input.units = units;
    if (metres !== undefined) input.tolerance = metres;
    reimport.mutate({ drawingId: drawing.id, input }, { onSuccess: onReimported });
  };

  const tolHint = drawing.result
    ? `Now ${formatTolerance(drawing.result.tolerance.value, toleranceUnit)}${drawing.result.tolerance.source === 'default' ? ', the default for this drawing’s size' : ''}. Leave empty for the default.`
    : 'Leave empty for the default: 1/10 000 of the drawing’s diagonal.';

  return (
    <form onSubmit={submit} className="flex flex-col gap-4" noValidate>
      <fieldset className="flex flex-col gap-1">
        <legend className="mb-1 text-xs font-semibold text-ink-soft">Member layers</legend>
        {lineLayers.length === 0 ? (
          <p className="text-sm text-ink-soft">No layer of this drawing holds lines.</p>
        ) : (
          <div className="flex flex-wrap gap-x-4 gap-y-1">
            {lineLayers.map((l) => (
              <label key={l.name} className="inline-flex items-center gap-1.5 text-sm">
                <input type="checkbox" className="accent-accent" checked={layers.has(l.name)} onChange={() => toggleLayer(l.name)} />
                {l.name}
                <span className="figures text-xs text-ink-faint">
                  ({l.segments} {l.segments === 1 ? 'segment' : 'segments'})
                </span>
              </label>
            ))}
          </div>
        )}
        {errors.layers && <p className="text-xs text-danger">{errors.layers}</p>}
      </fieldset>

      <SelectField
        label="Units"
        value={units}
        onChange={(e) => setUnits(e.target.value as DxfLengthUnit | '')}
        error={errors.units}
        hint={own.words ? `The drawing says: ${own.words}.` : undefined}
      >
        <option value="">{own.unitless ? 'Choose the units…' : own.words ? `As drawn (${own.words})` : 'As the drawing says'}</option>
        {dxfLengthUnitSchema.options.map((u) => (
          <option key={u} value={u}>
            {DRAWING_UNIT_LABELS[u]}
          </option>
        ))}
      </SelectField>

      <TextField
        label={`Tolerance (${toleranceUnit.symbol})`}
        inputMode="decimal"
        value={tolerance}
        placeholder="Default"
        onChange={(e) => setTolerance(e.target.value)}
        error={errors.tolerance}
        hint={tolHint}
        className="figures"
      />

      <FormError message={reimport.isError ? errorMessage(reimport.error) : undefined} />
      <div>
        <Button type="submit" variant="primary" busy={reimport.isPending}>
          Re-import
        </Button>
      </div>
    </form>
  );
}

import { useRef, useState, type DragEvent } from 'react';
import { dxfLengthUnitSchema, type DxfImportOptions, type DxfLengthUnit } from '@shared/dxf-import';
import type { DrawingView } from '@shared/schemas/drawing.schema';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { useUploadDrawing } from '../api/upload-drawing';
import { DRAWING_UNIT_LABELS, formatBytes, parseTolerance, type ToleranceUnit } from '../utils/units';

interface UploadZoneProps {
  trussId: number;
  toleranceUnit: ToleranceUnit;
  /** The upload is this truss's first drawing (the zone then explains itself more). */
  first: boolean;
  onUploaded: (drawing: DrawingView) => void;
  onCancel?: () => void;
}

/**
 * Drop a DXF here or pick one: it is sent with a progress bar as the truss's next drawing
 * version, with optional units, tolerance and layers. A refused file gets the API's sentence.
 */
export function UploadZone({ trussId, toleranceUnit, first, onUploaded, onCancel }: UploadZoneProps) {
  const inputRef = useRef<HTMLInputElement>(null);
  const [dragging, setDragging] = useState(false);
  const [progress, setProgress] = useState<number | null>(null);
  const [sending, setSending] = useState<File | null>(null);
  const [showOptions, setShowOptions] = useState(false);
  const [units, setUnits] = useState<DxfLengthUnit | ''>('');
  const [tolerance, setTolerance] = useState('');
  const [layers, setLayers] = useState('');
  const [localError, setLocalError] = useState<string>();
  const upload = useUploadDrawing();

  const send = (file: File | undefined) => {
    if (!file || upload.isPending) return;
    const options: DxfImportOptions = {};
    if (units) options.units = units;
    const metres = parseTolerance(tolerance, toleranceUnit);
    if (Number.isNaN(metres)) {
      setLocalError(`Write the tolerance as a number above 0, in ${toleranceUnit.symbol}, or leave it empty for the default.`);
      return;
    }
    if (metres !== undefined) options.tolerance = metres;
    const names = layers.split(',').map((s) => s.trim()).filter(Boolean);
    if (names.length) options.layers = names;
    setLocalError(undefined);
    setSending(file);
    setProgress(0);
    upload.mutate(
      { trussId, file, options, onProgress: setProgress },
      {
        onSuccess: onUploaded,
        onSettled: () => {
          setProgress(null);
          if (inputRef.current) inputRef.current.value = '';
        },
      },
    );
  };

  const onDrop = (event: DragEvent) => {
    event.preventDefault();
    setDragging(false);
    send(event.dataTransfer.files[0]);
  };

  const message = localError ?? (upload.isError ? errorMessage(upload.error) : undefined);
  const busy = upload.isPending;

  return (
    <div className="flex flex-col gap-3">
      <div
        onDragOver={(e) => {
          e.preventDefault();
          if (!busy) setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={onDrop}
        className={`flex flex-col items-center justify-center gap-3 rounded-xs border-2 border-dashed px-6 text-center transition-colors ${first ? 'py-12' : 'py-8'} ${
          dragging ? 'border-accent bg-accent-soft/60' : 'border-paper-line bg-paper'
        }`}
      >
        <svg viewBox="0 0 48 32" className="h-8 w-12 text-ink-faint" aria-hidden>
          <path d="M4 28 L24 6 L44 28 Z M14 28 L24 6 L34 28 M24 6 V28" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
        </svg>
        {busy && sending ? (
          <div className="w-full max-w-sm" aria-live="polite">
            <p className="mb-2 text-sm text-ink">
              Sending <span className="font-medium">{sending.name}</span> <span className="figures text-ink-faint">({formatBytes(sending.size)})</span>
            </p>
            <div
              role="progressbar"
              aria-label="Upload progress"
              aria-valuemin={0}
              aria-valuemax={100}
              aria-valuenow={Math.round((progress ?? 0) * 100)}
              className="h-1.5 w-full overflow-hidden border border-paper-rule bg-paper-raised"
            >
              <div className="h-full bg-accent transition-[width]" style={{ width: `${Math.round((progress ?? 0) * 100)}%` }} />
            </div>
            <p className="figures mt-1.5 text-xs text-ink-soft">
              {progress !== null && progress >= 1 ? 'Sent; importing the drawing…' : `${Math.round((progress ?? 0) * 100)} % sent`}
            </p>
          </div>
        ) : (
          <>
            <p className="text-sm text-ink">
              {first ? 'Drop the truss’s DXF drawing here' : 'Drop a corrected DXF here for the next drawing version'}
              <span className="text-ink-soft"> or </span>
              <Button size="sm" variant="secondary" onClick={() => inputRef.current?.click()}>
                Choose a file…
              </Button>
            </p>
            <p className="text-xs text-ink-faint">ASCII DXF from R12 on, in mm, cm, m, in or ft. Earlier drawing versions stay kept.</p>
          </>
        )}
        <input
          ref={inputRef}
          type="file"
          accept=".dxf,application/dxf,image/vnd.dxf"
          className="sr-only"
          aria-label="DXF file"
          tabIndex={-1}
          onChange={(e) => send(e.target.files?.[0])}
        />
      </div>

      <FormError message={message} />

      <div className="flex flex-wrap items-center justify-between gap-2">
        <button type="button" className="text-xs font-medium text-accent hover:underline" aria-expanded={showOptions} onClick={() => setShowOptions((v) => !v)}>
          {showOptions ? 'Hide import options' : 'Import options (optional)'}
        </button>
        {onCancel && !busy && (
          <Button size="sm" variant="quiet" onClick={onCancel}>
            Close
          </Button>
        )}
      </div>
      {showOptions && (
        <div className="grid gap-3 sm:grid-cols-3">
          <SelectField label="Units" value={units} onChange={(e) => setUnits(e.target.value as DxfLengthUnit | '')} hint="Needed when the drawing has none.">
            <option value="">As the drawing says</option>
            {dxfLengthUnitSchema.options.map((u) => (
              <option key={u} value={u}>
                {DRAWING_UNIT_LABELS[u]}
              </option>
            ))}
          </SelectField>
          <TextField
            label={`Tolerance (${toleranceUnit.symbol})`}
            inputMode="decimal"
            placeholder="Default"
            value={tolerance}
            onChange={(e) => setTolerance(e.target.value)}
            hint="Endpoints closer than this join."
            className="figures"
          />
          <TextField label="Layers" placeholder="All layers with lines" value={layers} onChange={(e) => setLayers(e.target.value)} hint="Names, separated by commas." />
        </div>
      )}
    </div>
  );
}

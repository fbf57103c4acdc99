import { useMemo, useState, type ReactNode } from 'react';
import type { UnitSystem } from '@shared/schemas/project.schema';
import type { DrawingView } from '@shared/schemas/drawing.schema';
import { Button } from '@/components/ui/button';
import { Badge, Panel } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { formatDateTime } from '@/lib/format';
import { notify } from '@/lib/notices';
import { useDrawing } from '../api/get-drawing';
import { useDrawings } from '../api/get-drawings';
import { layerColours } from '../utils/layer-colours';
import { reportEntryHighlight } from '../utils/report-highlight';
import { toleranceUnitFor, type ToleranceUnit } from '../utils/units';
import { DrawingCanvas } from './drawing-canvas';
import { DrawingVersions } from './drawing-versions';
import { ImportReport } from './import-report';
import { LayerList } from './layer-list';
import { ReimportForm } from './reimport-form';
import { UploadZone } from './upload-zone';

interface DrawingSectionProps {
  trussId: number;
  /** Drafters and engineers send drawings; the server refuses everyone else anyway. */
  mayUpload: boolean;
  /** The project's unit system: tolerances are shown in mm (SI) or in (US). */
  unitSystem?: UnitSystem;
}

/**
 * A truss's drawing: its versions, the chosen version drawn with its layers and import report,
 * the options to import it again, and (for drafters and engineers) the upload of a new version.
 */
export function DrawingSection({ trussId, mayUpload, unitSystem }: DrawingSectionProps) {
  const versions = useDrawings(trussId);
  const [chosenId, setChosenId] = useState<number | null>(null);
  const [uploadOpen, setUploadOpen] = useState(false);
  const toleranceUnit = toleranceUnitFor(unitSystem);

  if (versions.isPending) return <LoadingState label="Loading the drawing…" />;
  if (versions.isError) return <ErrorState title="The drawing versions could not be loaded" error={versions.error} onRetry={() => void versions.refetch()} />;

  const list = versions.data;
  const selectedId = chosenId ?? list[0]?.id ?? null;

  const onUploaded = (drawing: DrawingView) => {
    setChosenId(drawing.id);
    setUploadOpen(false);
    notify(
      drawing.status === 'imported' ? 'success' : 'error',
      drawing.status === 'imported'
        ? `Drawing version ${drawing.version} imported: ${drawing.jointCount} joints, ${drawing.memberCount} members.`
        : `Drawing version ${drawing.version} is stored but did not import: set its options and re-import.`,
    );
  };

  const versionsPanel = (
    <Panel title={<span>Drawing versions <span className="figures font-normal text-ink-faint">({list.length})</span></span>}>
      <DrawingVersions versions={list} selectedId={selectedId} onSelect={setChosenId} />
    </Panel>
  );

  if (list.length === 0) {
    return mayUpload ? (
      <Panel title="Upload the drawing">
        <UploadZone trussId={trussId} toleranceUnit={toleranceUnit} first onUploaded={onUploaded} />
      </Panel>
    ) : (
      <EmptyState>No drawing yet. A drafter or engineer uploads the truss’s DXF here.</EmptyState>
    );
  }

  return (
    <div className="flex flex-col gap-6">
      {mayUpload && uploadOpen && (
        <Panel title="Upload a new drawing version">
          <UploadZone trussId={trussId} toleranceUnit={toleranceUnit} first={false} onUploaded={onUploaded} onCancel={() => setUploadOpen(false)} />
        </Panel>
      )}
      {selectedId !== null && (
        <SelectedDrawing
          key={selectedId}
          drawingId={selectedId}
          newest={selectedId === list[0]?.id}
          toleranceUnit={toleranceUnit}
          mayUpload={mayUpload}
          uploadAction={
            mayUpload && !uploadOpen ? (
              <Button size="sm" variant="primary" onClick={() => setUploadOpen(true)}>
                Upload a new drawing version
              </Button>
            ) : null
          }
          versionsPanel={versionsPanel}
        />
      )}
    </div>
  );
}

interface SelectedDrawingProps {
  drawingId: number;
  newest: boolean;
  toleranceUnit: ToleranceUnit;
  mayUpload: boolean;
  uploadAction: ReactNode;
  /** The version list, set beside the import options. */
  versionsPanel: ReactNode;
}

function SelectedDrawing({ drawingId, ...rest }: SelectedDrawingProps) {
  const drawing = useDrawing(drawingId);
  if (drawing.isPending) return <LoadingState label="Loading the drawing…" />;
  if (drawing.isError) {
    return (
      <>
        <ErrorState title="This drawing version could not be loaded" error={drawing.error} onRetry={() => void drawing.refetch()} />
        {rest.versionsPanel}
      </>
    );
  }
  return <DrawingWorkspace drawing={drawing.data} {...rest} />;
}

function DrawingWorkspace({ drawing, newest, toleranceUnit, mayUpload, uploadAction, versionsPanel }: Omit<SelectedDrawingProps, 'drawingId'> & { drawing: DrawingView }) {
  const [selectedEntry, setSelectedEntry] = useState<number | null>(null);
  const [revealKey, setRevealKey] = useState(0);
  const [hiddenLayers, setHiddenLayers] = useState<Set<string>>(new Set());
  const result = drawing.result;

  const colours = useMemo(() => layerColours(drawing.layers.filter((l) => l.holdsLines).map((l) => l.name)), [drawing.layers]);
  const entry = result && selectedEntry !== null ? result.report[selectedEntry] : undefined;
  const highlight = useMemo(() => (result && entry ? reportEntryHighlight(entry, result) : null), [result, entry]);

  const chooseEntry = (index: number | null) => {
    setSelectedEntry(index);
    setRevealKey((k) => k + 1);
    // A highlighted member on a hidden layer would be invisible: show its layer again.
    const e = index !== null ? result?.report[index] : undefined;
    if (e && result && e.members.length) {
      const layersOf = new Set(result.members.filter((m) => e.members.includes(m.id)).map((m) => m.layer));
      setHiddenLayers((h) => new Set([...h].filter((l) => !layersOf.has(l))));
    }
  };
  const toggleLayer = (name: string) =>
    setHiddenLayers((h) => {
      const next = new Set(h);
      if (next.has(name)) next.delete(name);
      else next.add(name);
      return next;
    });

  const title = (
    <span className="flex flex-wrap items-baseline gap-x-2">
      <span>Drawing version {drawing.version}</span>
      <span className="font-normal text-ink-soft">{drawing.originalName}</span>
      {!newest && <Badge tone="muted">Older drawing version</Badge>}
      {drawing.status === 'failed' && <Badge tone="danger">Needs options</Badge>}
    </span>
  );

  return (
    <>
      <Panel title={title} actions={uploadAction}>
        <p className="figures -mt-1 mb-3 text-xs text-ink-soft">
          {result
            ? `${result.joints.length} joints · ${result.members.length} members · read in ${result.units.name}${result.units.source === 'option' ? ' (chosen)' : ''} · imported ${formatDateTime(drawing.importedAt)}`
            : `Uploaded ${formatDateTime(drawing.createdAt)} by ${drawing.uploadedBy || 'someone'}; not imported yet.`}
          {!newest && ' · the working model follows the newest drawing version only'}
        </p>
        {result ? (
          <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,1fr)_21rem]">
            <div className="min-w-0">
              <DrawingCanvas result={result} colours={colours} hiddenLayers={hiddenLayers} highlight={highlight} revealKey={revealKey} />
              <h3 className="mt-5 mb-1 text-xs font-semibold text-ink-soft">Layers</h3>
              <LayerList layers={drawing.layers} result={result} colours={colours} hidden={hiddenLayers} onToggle={toggleLayer} />
            </div>
            <aside className="min-w-0">
              <h3 className="mb-1 text-xs font-semibold text-ink-soft">Import report</h3>
              <ImportReport entries={result.report} selected={selectedEntry} onSelect={chooseEntry} />
            </aside>
          </div>
        ) : (
          <div role="alert" className="rounded-xs border border-danger/30 bg-danger/5 px-4 py-3 text-sm">
            <p className="font-medium text-danger">This drawing version did not import.</p>
            <p className="mt-1 text-ink">{drawing.error?.message ?? 'The import stopped without saying why.'}</p>
            {mayUpload && <p className="mt-1 text-ink-soft">Set the options below and re-import; the file stays stored.</p>}
          </div>
        )}
      </Panel>

      <div className={`grid grid-cols-1 gap-6 ${mayUpload ? 'lg:grid-cols-[minmax(0,20rem)_minmax(0,1fr)]' : ''}`}>
        {mayUpload && (
          <Panel title="Import options">
            <ReimportForm
              key={`${drawing.id}-${drawing.importedAt}`}
              drawing={drawing}
              toleranceUnit={toleranceUnit}
              onReimported={(d) => {
                setSelectedEntry(null);
                notify('success', `Drawing version ${d.version} re-imported: ${d.jointCount} joints, ${d.memberCount} members.`);
              }}
            />
          </Panel>
        )}
        {versionsPanel}
      </div>
    </>
  );
}

import { useSearchParams } from 'react-router-dom';
import type { RunSummaryView } from '@shared/schemas/run.schema';
import type { UnitSystemId } from '@shared/units';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError, errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useCreateRun } from '../api/create-run';
import { useTrussModel } from '../api/get-model';
import { useRuns } from '../api/get-runs';
import { draftIsKept } from '../utils/draft-store';
import { RunResults } from './run-results';
import { RunStatusBadge } from './run-status-badge';
import { TH, TH_RIGHT } from './supports-table';

/** Status of a run in words, with its progress while it works. */
const KIND_WORDS = { determinate: 'determinate', indeterminate: 'indeterminate', unstable: 'unstable' } as const;

/** "Runs & results": start a run, see every run with who and when, and read the chosen one. */
export function RunsWorkspace({ trussId, mayRun, unitSystem }: { trussId: number; mayRun: boolean; unitSystem: UnitSystemId }) {
  const runs = useRuns(trussId);
  const model = useTrussModel(trussId);
  const create = useCreateRun();
  const [params, setParams] = useSearchParams();
  const chosen = Number(params.get('run'));
  const selectedId = runs.data?.some((r) => r.id === chosen) ? chosen : runs.data?.[0]?.id;

  const select = (id: number) =>
    setParams(
      (p) => {
        const next = new URLSearchParams(p);
        next.set('run', String(id));
        return next;
      },
      { replace: true },
    );

  const start = async () => {
    try {
      const run = await create.mutateAsync({ trussId, input: model.data ? { modelVersion: model.data.version } : {} });
      select(run.id);
    } catch {
      // The mutation's error is shown under the button.
    }
  };

  const noModel = model.isError && model.error instanceof ApiError && model.error.code === 'no-model-yet';

  return (
    <div className="flex flex-col gap-5">
      <Panel
        title="Analysis runs"
        actions={
          mayRun ? (
            <Button variant="primary" size="sm" onClick={() => void start()} busy={create.isPending} disabled={!model.data}>
              Run analysis
            </Button>
          ) : undefined
        }
      >
        {mayRun && model.data && (
          <p className="mb-3 text-xs text-ink-soft">
            A run solves the saved model, model save <span className="figures">{model.data.version}</span>, and keeps a copy of it with its results.
            {draftIsKept(trussId) && ' You have unsaved edits on the Model & loads tab: save them first to include them.'}
          </p>
        )}
        {noModel && <p className="mb-3 text-sm text-ink-soft">Upload the truss’s drawing first: a run needs its joints and members.</p>}
        {create.isError && (
          <p role="alert" className="mb-3 text-sm text-danger">
            {errorMessage(create.error)}
          </p>
        )}
        {runs.isPending ? (
          <LoadingState label="Loading the runs…" />
        ) : runs.isError ? (
          <ErrorState error={runs.error} title="The runs could not be loaded" onRetry={() => void runs.refetch()} />
        ) : runs.data.length === 0 ? (
          <p className="py-4 text-sm text-ink-soft">No runs yet.{mayRun ? ' Put supports and loads on the model, save it, then run the analysis.' : ''}</p>
        ) : (
          <div className="max-h-72 overflow-y-auto">
            <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
              <thead className="sticky top-0 bg-paper-raised">
                <tr className="border-y border-ink-soft">
                  <th className={TH}>Run</th>
                  <th className={TH}>Status</th>
                  <th className={TH}>Truss</th>
                  <th className={TH_RIGHT}>Model save</th>
                  <th className={TH}>Ran by</th>
                  <th className={TH}>When</th>
                </tr>
              </thead>
              <tbody>
                {runs.data.map((r) => {
                  const active = r.id === selectedId;
                  return (
                    <tr key={r.id} className={`border-b border-paper-line/70 ${active ? 'bg-accent-soft/50' : 'hover:bg-paper'}`}>
                      <td className="px-2 py-1.5">
                        <button type="button" className="figures font-medium text-accent hover:underline" aria-current={active || undefined} onClick={() => select(r.id)}>
                          Run {r.number}
                        </button>
                      </td>
                      <td className="px-2 py-1.5">
                        <RunStatusBadge run={r} />
                      </td>
                      <td className="px-2 py-1.5 text-ink-soft">
                        {r.classification
                          ? `${KIND_WORDS[r.classification.kind]}${r.classification.kind === 'indeterminate' ? ` (degree ${r.classification.degree})` : ''}`
                          : r.error
                            ? <span className="block max-w-xs truncate" title={r.error.message}>{r.error.message}</span>
                            : '—'}
                      </td>
                      <td className="figures px-2 py-1.5 text-right whitespace-nowrap">
                        {r.modelVersion}
                        {r.stale && (
                          <span className="ml-2 text-[11px] font-medium text-compression" title="The model has been saved since this run: its results no longer match the model.">
                            out of date: the model changed after this run
                          </span>
                        )}
                      </td>
                      <td className="px-2 py-1.5 text-ink-soft">{r.ranBy}</td>
                      <td className="figures px-2 py-1.5 text-ink-soft">{formatDateTime(r.createdAt)}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      {selectedId !== undefined && <RunResults key={selectedId} runId={selectedId} unitSystem={unitSystem} mayRun={mayRun} />}
    </div>
  );
}

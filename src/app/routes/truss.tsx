import { Link, useParams } from 'react-router-dom';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { DrawingSection } from '@/features/drawings/components/drawing-section';
import { useProject } from '@/features/projects/api/get-project';
import { TrussSheets } from '@/features/sheet-revisions/components/truss-sheets';
import { useTruss } from '@/features/trusses/api/get-truss';
import { TrussPage } from '@/features/trusses/components/truss-page';
import { TrussTabs, type TrussTab } from '@/features/trusses/components/truss-tabs';
import { DesignWorkspace } from '@/features/workspace/components/design-editor';
import { ModelWorkspace } from '@/features/workspace/components/model-editor';
import { RunsWorkspace } from '@/features/workspace/components/runs-section';
import { canUploadDrawings } from '@/lib/permissions';
import { useCurrentUser } from '../current-user';

export function TrussRoute() {
  const trussId = Number(useParams().trussId);
  if (!Number.isInteger(trussId) || trussId <= 0) {
    return <EmptyState>This is not a truss address. Open the truss from its project.</EmptyState>;
  }
  return <TrussRouteLoaded trussId={trussId} />;
}

function TrussRouteLoaded({ trussId }: { trussId: number }) {
  const user = useCurrentUser();
  const truss = useTruss(trussId);
  const project = useProject(truss.data?.projectId ?? 0, { enabled: truss.isSuccess });

  if (truss.isPending) return <LoadingState label="Loading the truss…" />;
  if (truss.isError) {
    return (
      <div>
        <ErrorState title="The truss could not be loaded" error={truss.error} onRetry={() => void truss.refetch()} />
        <Link to="/projects" className="text-sm font-medium text-accent hover:underline">
          Back to the projects
        </Link>
      </div>
    );
  }

  const projectLabel = project.data ? `${project.data.jobNumber} ${project.data.name}` : undefined;
  // Each feature of the truss page is one tab; later ones (loads, analysis) go beside the drawing.
  const tabs: TrussTab[] = [
    {
      id: 'drawing',
      label: 'Drawing',
      content: <DrawingSection trussId={trussId} mayUpload={canUploadDrawings(user.role)} unitSystem={project.data?.unitSystem} />,
    },
    // Engineers edit the model and run it; everyone else reads (the server enforces both).
    { id: 'model', label: 'Model & loads', content: <ModelWorkspace trussId={trussId} mayEdit={user.role === 'engineer'} /> },
    { id: 'design', label: 'Member design', content: <DesignWorkspace trussId={trussId} mayEdit={user.role === 'engineer'} unitSystem={project.data?.unitSystem === 'US' ? 'us' : 'si'} /> },
    {
      id: 'runs',
      label: 'Runs & results',
      content: <RunsWorkspace trussId={trussId} mayRun={user.role === 'engineer'} unitSystem={project.data?.unitSystem === 'US' ? 'us' : 'si'} />,
    },
    { id: 'sheets', label: 'Calc sheets', content: <TrussSheets trussId={trussId} user={user} /> },
  ];
  return (
    <TrussPage truss={truss.data} projectLabel={projectLabel}>
      <TrussTabs tabs={tabs} />
    </TrussPage>
  );
}

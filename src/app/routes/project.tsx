import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import type { ProjectView } from '@shared/schemas/project.schema';
import { Button } from '@/components/ui/button';
import { Badge, PageHeader, Panel } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState, NoteLine } from '@/components/ui/states';
import { useProject } from '@/features/projects/api/get-project';
import { useUpdateProject } from '@/features/projects/api/update-project';
import { ProjectDetails } from '@/features/projects/components/project-details';
import { EditProjectForm } from '@/features/projects/components/project-form';
import { useTrusses } from '@/features/trusses/api/get-trusses';
import { AddTrussForm } from '@/features/trusses/components/add-truss-form';
import { TrussesTable } from '@/features/trusses/components/trusses-table';
import { notify } from '@/lib/notices';
import { canAddTrusses, canManageProjects } from '@/lib/permissions';
import { useCurrentUser } from '../current-user';

export function ProjectRoute() {
  const projectId = Number(useParams().projectId);
  if (!Number.isInteger(projectId) || projectId <= 0) {
    return <EmptyState>This is not a project address. Pick the project from the list.</EmptyState>;
  }
  return <ProjectPage projectId={projectId} />;
}

function ProjectPage({ projectId }: { projectId: number }) {
  const project = useProject(projectId);
  if (project.isPending) return <LoadingState label="Loading the project…" />;
  if (project.isError) {
    return (
      <div>
        <ErrorState title="The project could not be loaded" error={project.error} onRetry={() => void project.refetch()} />
        <Link to="/projects" className="text-sm font-medium text-accent hover:underline">
          Back to the projects
        </Link>
      </div>
    );
  }
  return <ProjectLoaded project={project.data} />;
}

function ProjectLoaded({ project }: { project: ProjectView }) {
  const user = useCurrentUser();
  const navigate = useNavigate();
  const [editing, setEditing] = useState(false);
  const [addingTruss, setAddingTruss] = useState(false);
  const archive = useUpdateProject();
  const trusses = useTrusses(project.id);
  const mayManage = canManageProjects(user.role);
  const mayAddTruss = canAddTrusses(user.role) && !project.archived;

  const toggleArchived = () =>
    archive.mutate(
      { projectId: project.id, changes: { archived: !project.archived } },
      {
        onSuccess: (p) =>
          notify('success', p.archived ? `Project ${p.jobNumber} archived. It stays readable.` : `Project ${p.jobNumber} is active again.`),
      },
    );

  return (
    <div>
      <PageHeader
        eyebrow={
          <Link to="/projects" className="normal-case hover:text-accent">
            ← Projects
          </Link>
        }
        title={
          <span className="flex flex-wrap items-baseline gap-x-3">
            <span className="text-ink-soft">{project.jobNumber}</span>
            <span>{project.name}</span>
            {project.archived && <Badge tone="muted">Archived</Badge>}
          </span>
        }
        actions={
          mayManage &&
          !editing && (
            <>
              <Button onClick={() => setEditing(true)}>Edit details</Button>
              <Button variant={project.archived ? 'secondary' : 'danger'} busy={archive.isPending} onClick={toggleArchived}>
                {project.archived ? 'Unarchive' : 'Archive'}
              </Button>
            </>
          )
        }
      />

      {project.archived && (
        <NoteLine className="mb-6">
          This project is archived: it stays readable, and no trusses can be added until it is unarchived.
        </NoteLine>
      )}

      <div className={`grid grid-cols-1 gap-6 ${editing ? 'lg:grid-cols-[minmax(0,34rem)_1fr]' : 'lg:grid-cols-[minmax(0,22rem)_1fr]'}`}>
        <Panel title="Details">
          {editing ? (
            <EditProjectForm
              project={project}
              onCancel={() => setEditing(false)}
              onSaved={() => {
                setEditing(false);
                notify('success', 'Project details saved.');
              }}
            />
          ) : (
            <ProjectDetails project={project} />
          )}
        </Panel>

        <Panel
          title={
            <span>
              Trusses{' '}
              {trusses.data && <span className="figures font-normal text-ink-faint">({trusses.data.length})</span>}
            </span>
          }
          actions={
            mayAddTruss &&
            !addingTruss && (
              <Button size="sm" variant="primary" onClick={() => setAddingTruss(true)}>
                Add truss
              </Button>
            )
          }
        >
          {addingTruss && (
            <div className="mb-4 border-b border-paper-line pb-4">
              <AddTrussForm
                projectId={project.id}
                onCancel={() => setAddingTruss(false)}
                onAdded={(truss) => {
                  notify('success', `Truss “${truss.name}” added.`);
                  navigate(`/trusses/${truss.id}`);
                }}
              />
            </div>
          )}
          {trusses.isPending ? (
            <LoadingState label="Loading trusses…" />
          ) : trusses.isError ? (
            <ErrorState title="The trusses could not be loaded" error={trusses.error} onRetry={() => void trusses.refetch()} />
          ) : trusses.data.length === 0 && !addingTruss ? (
            <EmptyState>
              No trusses yet.
              {mayAddTruss ? ' Add one, then bring in its drawing.' : ' A drafter or engineer adds them.'}
            </EmptyState>
          ) : (
            <TrussesTable trusses={trusses.data} />
          )}
        </Panel>
      </div>
    </div>
  );
}

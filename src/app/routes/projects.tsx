import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { CONTROL_CLASS } from '@/components/ui/field';
import { PageHeader, Panel } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useProjects } from '@/features/projects/api/get-projects';
import { CreateProjectForm } from '@/features/projects/components/project-form';
import { ProjectsTable } from '@/features/projects/components/projects-table';
import { notify } from '@/lib/notices';
import { canManageProjects } from '@/lib/permissions';
import { useCurrentUser } from '../current-user';

export function ProjectsRoute() {
  const user = useCurrentUser();
  const navigate = useNavigate();
  const [filter, setFilter] = useState('');
  const [includeArchived, setIncludeArchived] = useState(false);
  const [creating, setCreating] = useState(false);
  const projects = useProjects({ includeArchived });
  const mayCreate = canManageProjects(user.role);

  return (
    <div>
      <PageHeader
        title="Projects"
        description="Every project of the firm. Open one to see its trusses."
        actions={
          mayCreate &&
          !creating && (
            <Button variant="primary" onClick={() => setCreating(true)}>
              New project
            </Button>
          )
        }
      />

      {creating && (
        <Panel title="New project" className="mb-6">
          <CreateProjectForm
            onCancel={() => setCreating(false)}
            onCreated={(project) => {
              notify('success', `Project ${project.jobNumber} created.`);
              navigate(`/projects/${project.id}`);
            }}
          />
        </Panel>
      )}

      <div className="mb-3 flex flex-wrap items-center gap-4">
        <input
          type="search"
          value={filter}
          onChange={(e) => setFilter(e.target.value)}
          placeholder="Filter by job number, name, client or site"
          aria-label="Filter projects"
          className={`${CONTROL_CLASS} w-full max-w-sm`}
        />
        <label className="flex items-center gap-2 text-sm text-ink-soft">
          <input type="checkbox" checked={includeArchived} onChange={(e) => setIncludeArchived(e.target.checked)} className="accent-accent" />
          Show archived
        </label>
        {projects.data && (
          <span className="figures ml-auto text-xs text-ink-faint">
            {projects.data.length} {projects.data.length === 1 ? 'project' : 'projects'}
            {projects.isFetching && ' · refreshing…'}
          </span>
        )}
      </div>

      {projects.isPending ? (
        <LoadingState label="Loading projects…" />
      ) : projects.isError ? (
        <ErrorState title="The projects could not be loaded" error={projects.error} onRetry={() => void projects.refetch()} />
      ) : (
        <ProjectsTable projects={projects.data} filter={filter} />
      )}
    </div>
  );
}

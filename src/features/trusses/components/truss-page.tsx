import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { TrussView } from '@shared/schemas/project.schema';
import { PageHeader } from '@/components/ui/page-header';
import { formatDateTime } from '@/lib/format';

interface TrussPageProps {
  truss: TrussView;
  /** How the route names the project in the way back, e.g. "24-031 Riverside depot roof". */
  projectLabel?: string;
  /** Actions beside the title (later: upload a drawing, run the analysis). */
  actions?: ReactNode;
  /** The sections of the page, composed by the route from other features. */
  children: ReactNode;
}

/**
 * The frame of one truss's page: the way back to its project, its name and dates.
 * Features such as the drawing import fill the body through `children`.
 */
export function TrussPage({ truss, projectLabel, actions, children }: TrussPageProps) {
  return (
    <div>
      <PageHeader
        eyebrow={
          <Link to={`/projects/${truss.projectId}`} className="normal-case hover:text-accent">
            ← {projectLabel ?? 'Back to the project'}
          </Link>
        }
        title={truss.name}
        description={
          <span className="figures">
            Added {formatDateTime(truss.createdAt)} · updated {formatDateTime(truss.updatedAt)}
          </span>
        }
        actions={actions}
      />
      <div className="flex flex-col gap-6">{children}</div>
    </div>
  );
}

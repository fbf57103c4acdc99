import type { ProjectView } from '@shared/schemas/project.schema';
import { formatDateTime, UNIT_SYSTEM_LABELS } from '@/lib/format';

/** The project's particulars as the title block of its sheets will show them. */
export function ProjectDetails({ project }: { project: ProjectView }) {
  const rows: [string, React.ReactNode][] = [
    ['Client', project.client || <span className="text-ink-faint">Not given</span>],
    ['Site', project.site || <span className="text-ink-faint">Not given</span>],
    ['Units', UNIT_SYSTEM_LABELS[project.unitSystem]],
    ['Created', <time dateTime={project.createdAt}>{formatDateTime(project.createdAt)}</time>],
    ['Updated', <time dateTime={project.updatedAt}>{formatDateTime(project.updatedAt)}</time>],
  ];
  return (
    <div className="flex flex-col gap-4">
      <dl className="grid grid-cols-[6rem_1fr] gap-x-4 gap-y-1.5 text-sm">
        {rows.map(([label, value]) => (
          <div key={label} className="contents">
            <dt className="text-ink-faint">{label}</dt>
            <dd className="text-ink">{value}</dd>
          </div>
        ))}
      </dl>
      <div>
        <h3 className="mb-1 text-xs font-semibold text-ink-soft">Design basis</h3>
        {project.designBasis ? (
          <p className="text-sm leading-relaxed whitespace-pre-wrap text-ink">{project.designBasis}</p>
        ) : (
          <p className="text-sm text-ink-faint">Not stated yet. Every calc sheet states its design basis; add it before preparing one.</p>
        )}
      </div>
    </div>
  );
}

import { Link, useParams } from 'react-router-dom';
import { buttonClass } from '@/components/ui/button';
import { PageHeader, Panel } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState, NoteLine } from '@/components/ui/states';
import { sheetPreviewUrl, useSheet } from '@/features/sheet-revisions/api/get-sheet';
import { SheetActions } from '@/features/sheet-revisions/components/sheet-actions';
import { SheetAuditLog } from '@/features/sheet-revisions/components/sheet-audit-log';
import { archivedPdfUrl } from '@/features/records/api/get-archive';
import { SheetIssueRecord } from '@/features/records/components/sheet-issue-record';
import { SheetReview } from '@/features/sheet-revisions/components/sheet-review';
import { SheetSigners } from '@/features/sheet-revisions/components/sheet-signers';
import { SheetStatusBadge } from '@/features/sheet-revisions/components/sheet-status-badge';
import { SheetCheckerChange } from '@/features/sheet-revisions/components/sheet-checker-change';
import { isAdmin } from '@/lib/permissions';
import { useCurrentUser } from '../current-user';

export function SheetRoute() {
  const sheetId = Number(useParams().sheetId);
  if (!Number.isInteger(sheetId) || sheetId <= 0) {
    return <EmptyState>This is not a calc sheet address. Open the sheet from its truss or from the archive.</EmptyState>;
  }
  return <SheetRouteLoaded sheetId={sheetId} />;
}

function SheetRouteLoaded({ sheetId }: { sheetId: number }) {
  const user = useCurrentUser();
  const sheet = useSheet(sheetId);

  if (sheet.isPending) return <LoadingState label="Loading the calc sheet…" />;
  if (sheet.isError) {
    return (
      <div>
        <ErrorState title="The calc sheet could not be loaded" error={sheet.error} onRetry={() => void sheet.refetch()} />
        <Link to="/archive" className="text-sm font-medium text-accent hover:underline">
          Go to the archive
        </Link>
      </div>
    );
  }

  const s = sheet.data;
  const archived = s.status === 'issued' || s.status === 'superseded';
  return (
    <div>
      <PageHeader
        eyebrow={
          <span className="normal-case">
            <Link to={`/projects/${s.project.id}`} className="hover:text-accent">
              {s.project.jobNumber} {s.project.name}
            </Link>
            {' · '}
            <Link to={`/trusses/${s.truss.id}?tab=sheets`} className="hover:text-accent">
              {s.truss.name}
            </Link>
          </span>
        }
        title={
          <span className="inline-flex flex-wrap items-center gap-3">
            Calc sheet, revision {s.label}
            <SheetStatusBadge status={s.status} replacedBy={s.replacedBy} />
          </span>
        }
        description={<SheetSigners sheet={s} />}
        actions={
          <SheetActions sheet={s} user={user}>
            <a
              href={sheetPreviewUrl(s.id)}
              target="_blank"
              rel="noreferrer"
              className={buttonClass('secondary')}
            >
              Open sheet in a new tab
            </a>
            {archived && (
              <a
                href={archivedPdfUrl(s.id)}
                download
                className={buttonClass('primary')}
              >
                Download issued PDF
              </a>
            )}
          </SheetActions>
        }
      />

      {s.replacedBy && (
        <NoteLine className="mb-4">
          Returned and replaced by{' '}
          <Link to={`/sheets/${s.replacedBy.id}`} className="font-medium text-accent hover:underline">
            revision {s.replacedBy.label}
          </Link>
          . Its comments carry over to the new revision.
        </NoteLine>
      )}
      {s.status === 'in-check' && isAdmin(user.role) && <SheetCheckerChange key={`checker-${s.id}`} sheet={s} />}

      {s.supersededBy && (
        <NoteLine className="mb-4">
          Superseded by{' '}
          <Link to={`/sheets/${s.supersededBy.id}`} className="font-medium text-accent hover:underline">
            revision {s.supersededBy.label}
          </Link>
          . This revision stays in the archive as it was issued.
        </NoteLine>
      )}

      <SheetReview key={s.id} sheet={s} user={user} />

      <div className="mt-6 grid items-start gap-6 lg:grid-cols-2">
        <Panel title="Audit log">
          <SheetAuditLog events={s.events} />
        </Panel>
        {s.issue ? (
          <Panel title="Issued record">
            <SheetIssueRecord issue={s.issue} />
            <p className="mt-3 text-xs text-ink-faint">
              The sheet above is laid out again from the analysis run for reading; the downloaded PDF is the record as issued.
            </p>
          </Panel>
        ) : (
          <Panel title="Revision">
            <p className="text-sm text-ink-soft">
              Made from analysis run {s.runId}. When it is issued, the PDF is stored with its SHA-256 fingerprint and the
              record is signed with the firm’s key.
            </p>
          </Panel>
        )}
      </div>
    </div>
  );
}

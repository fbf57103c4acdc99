import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { Role } from '@shared/schemas/auth.schema';
import type { MyWorkView, WorkDrawingItem, WorkRevisionItem } from '@shared/schemas/review.schema';
import { Badge, Panel } from '@/components/ui/page-header';
import { formatDateTime } from '@/lib/format';

type ListKey = 'toCheck' | 'returnedToMe' | 'readyToIssue' | 'drawingsToFix';

const LISTS: Record<ListKey, { title: string; empty: string; action: string; since: string }> = {
  toCheck: {
    title: 'To check',
    empty: 'Nothing waits for your check. A revision sent to you for check appears here.',
    action: 'Check it',
    since: 'Sent',
  },
  returnedToMe: {
    title: 'Returned to me',
    empty: 'None of your revisions is waiting on you after a return.',
    action: 'Read the comments',
    since: 'Returned',
  },
  readyToIssue: {
    title: 'Checked, ready to issue',
    empty: 'None of your revisions is checked and waiting to be issued.',
    action: 'Issue it',
    since: 'Checked',
  },
  drawingsToFix: {
    title: 'Drawings with import problems',
    empty: 'Every newest drawing version imported without warnings.',
    action: 'Open the drawing',
    since: 'Imported',
  },
};

/** The lists a role has a part in, in the order people work through them. */
export function myWorkListsFor(role: Role): ListKey[] {
  if (role === 'reviewer') return ['toCheck'];
  if (role === 'engineer') return ['returnedToMe', 'readyToIssue'];
  if (role === 'drafter') return ['drawingsToFix'];
  return [];
}

/** Each list as a panel of rows; every row links to the page where the person acts on it. */
export function MyWorkLists({ work, role }: { work: MyWorkView; role: Role }) {
  const lists = myWorkListsFor(role);
  if (lists.length === 0) {
    return <p className="text-sm text-ink-soft">An admin has no sheets or drawings waiting on them; the lists here are for drafters, engineers and reviewers.</p>;
  }
  return (
    <div className="flex flex-col gap-6">
      {lists.map((key) => {
        const rows = work[key];
        return (
          <Panel key={key} title={`${LISTS[key].title} (${rows.length})`}>
            <section aria-label={LISTS[key].title}>
              {rows.length === 0 ? (
                <p className="text-sm text-ink-soft">{LISTS[key].empty}</p>
              ) : (
                <ul className="divide-y divide-paper-line">
                  {key === 'drawingsToFix'
                    ? (rows as WorkDrawingItem[]).map((d) => <DrawingRow key={d.drawingId} item={d} />)
                    : (rows as WorkRevisionItem[]).map((r) => <RevisionRow key={r.id} item={r} list={key} />)}
                </ul>
              )}
            </section>
          </Panel>
        );
      })}
    </div>
  );
}

function Where({ project, truss }: { project: WorkRevisionItem['project']; truss: WorkRevisionItem['truss'] }) {
  return (
    <span className="text-ink-soft">
      {project.jobNumber} {project.name} · {truss.name}
    </span>
  );
}

function Row({ main, detail, when, whenLabel }: { main: ReactNode; detail: ReactNode; when: string; whenLabel: string }) {
  return (
    <li className="flex flex-wrap items-baseline justify-between gap-x-6 gap-y-1 py-2 text-[13px]">
      <div className="min-w-0">
        <div>{main}</div>
        <div className="text-ink-soft">{detail}</div>
      </div>
      <span className="text-ink-faint">
        {whenLabel} <time dateTime={when}>{formatDateTime(when)}</time>
      </span>
    </li>
  );
}

function RevisionRow({ item, list }: { item: WorkRevisionItem; list: Exclude<ListKey, 'drawingsToFix'> }) {
  return (
    <Row
      main={
        <>
          <Link to={`/sheets/${item.id}`} className="font-semibold text-accent hover:underline">
            {LISTS[list].action}: revision {item.label}
          </Link>{' '}
          <Where project={item.project} truss={item.truss} />
        </>
      }
      detail={
        <>
          Prepared by {item.preparedBy.name}
          {list === 'toCheck' && !item.checker && ' · sent to every reviewer (before checkers were chosen)'}
          {item.openCommentCount > 0 && (
            <>
              {' · '}
              <span className="font-medium text-danger">
                {item.openCommentCount} open comment{item.openCommentCount === 1 ? '' : 's'}
              </span>
            </>
          )}
        </>
      }
      when={item.since}
      whenLabel={LISTS[list].since}
    />
  );
}

function DrawingRow({ item }: { item: WorkDrawingItem }) {
  return (
    <Row
      main={
        <>
          <Link to={`/trusses/${item.truss.id}`} className="font-semibold text-accent hover:underline">
            {LISTS.drawingsToFix.action}: drawing version {item.version}
          </Link>{' '}
          <Where project={item.project} truss={item.truss} />{' '}
          <Badge tone={item.status === 'failed' ? 'danger' : 'neutral'}>{item.status === 'failed' ? 'Import failed' : `${item.problemCount} warning${item.problemCount === 1 ? '' : 's'}`}</Badge>
        </>
      }
      detail={
        <>
          <span className="text-ink-faint">{item.originalName}: </span>
          {item.problems.join(' ')}
          {item.problemCount > item.problems.length && ` …and ${item.problemCount - item.problems.length} more.`}
        </>
      }
      when={item.importedAt}
      whenLabel={LISTS.drawingsToFix.since}
    />
  );
}

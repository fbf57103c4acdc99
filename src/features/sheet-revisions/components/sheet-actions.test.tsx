// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { SheetRevisionView } from '@shared/schemas/review.schema';
import { setCsrfToken } from '@/lib/api-client';
import { SheetActions } from './sheet-actions';

const fetchMock = vi.fn<typeof fetch>();

// An invented revision in check, prepared by user 7.
const sheet: SheetRevisionView = {
  id: 12,
  projectId: 1,
  trussId: 4,
  runId: 30,
  number: 2,
  label: 'B',
  status: 'in-check',
  preparedBy: { id: 7, name: 'Ines Varga' },
  checkedBy: null,
  checker: { id: 20, name: 'Noor Haddad' },
  issuedBy: null,
  createdAt: '2025-05-01T08:00:00Z',
  updatedAt: '2025-05-01T09:00:00Z',
  supersededBy: null,
  replacedBy: null,
  openCommentCount: 0,
  project: { id: 1, name: 'Millpond barn roof', jobNumber: 'MB-0412' },
  truss: { id: 4, name: 'T3 hip girder' },
  events: [],
  comments: [],
  openCommentIds: [],
  issue: null,
  pageUrl: 'http://localhost/sheets/12',
};
const reviewer = { id: 20, role: 'reviewer' as const };

function renderActions(view: SheetRevisionView = sheet, user: { id: number; role: 'reviewer' | 'engineer' } = reviewer) {
  return render(
    <QueryClientProvider client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}>
      <SheetActions sheet={view} user={user} />
    </QueryClientProvider>,
  );
}

beforeEach(() => {
  fetchMock.mockReset();
  vi.stubGlobal('fetch', fetchMock);
  setCsrfToken('test-token');
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('SheetActions', () => {
  it('when a reviewer returns a revision without a note, then nothing is sent and the note is asked for', () => {
    renderActions();
    fireEvent.click(screen.getByRole('button', { name: 'Return to the preparer' }));
    fireEvent.click(screen.getAllByRole('button', { name: 'Return to the preparer' }).at(-1)!);
    expect(screen.getByText('Say why it goes back: the preparer reads this first.')).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('when another reviewer got there first, then the 409 message is shown as the server wrote it', async () => {
    const message = 'Revision B is checked; it can be returned only when it is in check. Reload the sheet to see its current status.';
    fetchMock.mockResolvedValue(new Response(JSON.stringify({ error: { code: 'sheet-status-conflict', message } }), { status: 409 }));
    renderActions();
    fireEvent.click(screen.getByRole('button', { name: 'Return to the preparer' }));
    fireEvent.change(screen.getByLabelText('Why it goes back'), { target: { value: 'Joint D load sign.' } });
    fireEvent.click(screen.getAllByRole('button', { name: 'Return to the preparer' }).at(-1)!);

    expect(await screen.findByText(message)).toBeTruthy();
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/sheets/12/return');
    expect(JSON.parse(String(init?.body))).toEqual({ note: 'Joint D load sign.' });
  });

  it('when threads are still open, then marking checked is held back with the count said', () => {
    renderActions({ ...sheet, openCommentIds: [3, 5] });
    const check = screen.getByRole('button', { name: 'Mark checked' }) as HTMLButtonElement;
    expect(check.disabled).toBe(true);
    expect(screen.getByText(/2 comment threads are still open/)).toBeTruthy();
  });

  it('when the preparer submits, then a checker must be chosen first, and the chosen one is sent', async () => {
    const draft: SheetRevisionView = { ...sheet, status: 'draft', checker: null };
    const checkers = [{ id: 20, name: 'Noor Haddad', email: 'noor@millpond.example' }];
    fetchMock.mockImplementation(async (url) =>
      String(url) === '/api/checkers' ? new Response(JSON.stringify(checkers), { status: 200 }) : new Response(JSON.stringify({ ...draft, status: 'in-check' }), { status: 200 }),
    );
    renderActions(draft, { id: 7, role: 'engineer' });
    fireEvent.click(screen.getByRole('button', { name: 'Submit for check' }));
    await screen.findByRole('option', { name: 'Noor Haddad (noor@millpond.example)' });
    fireEvent.click(screen.getAllByRole('button', { name: 'Submit for check' }).at(-1)!);
    expect(screen.getByText('Choose the checker: the reviewer who will check this revision.')).toBeTruthy();
    expect(fetchMock.mock.calls.map(([url]) => String(url))).toEqual(['/api/checkers']);

    fireEvent.change(screen.getByLabelText('Checker'), { target: { value: '20' } });
    fireEvent.click(screen.getAllByRole('button', { name: 'Submit for check' }).at(-1)!);
    await waitFor(() => expect(fetchMock.mock.calls.some(([url]) => String(url) === '/api/sheets/12/submit')).toBe(true));
    const [, init] = fetchMock.mock.calls.find(([url]) => String(url) === '/api/sheets/12/submit')!;
    expect(JSON.parse(String(init?.body))).toEqual({ note: '', checkerId: 20 });
  });
});

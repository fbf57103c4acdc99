// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import type { ProjectView } from '@shared/schemas/project.schema';
import { setCsrfToken } from '@/lib/api-client';
import { EditProjectForm } from './project-form';

const fetchMock = vi.fn<typeof fetch>();

const project: ProjectView = {
  id: 3,
  name: 'Millpond barn roof',
  jobNumber: 'MB-0412',
  client: 'Tollan Farms (invented)',
  site: 'North field, Millpond',
  designBasis: '',
  unitSystem: 'SI',
  archived: false,
  createdAt: '2025-01-01T00:00:00Z',
  updatedAt: '2025-01-02T00:00:00Z',
  trussCount: 0,
};

beforeEach(() => {
  fetchMock.mockReset();
  vi.stubGlobal('fetch', fetchMock);
  setCsrfToken('test-token');
});

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('EditProjectForm', () => {
  it('when one field is changed and saved, then every field is sent with its current value', async () => {
    fetchMock.mockImplementation(async (_url, init) => new Response(JSON.stringify({ ...project, ...JSON.parse(String(init?.body)) }), { status: 200 }));
    const onSaved = vi.fn();
    render(
      <QueryClientProvider client={new QueryClient()}>
        <EditProjectForm project={project} onSaved={onSaved} onCancel={() => {}} />
      </QueryClientProvider>,
    );

    fireEvent.change(screen.getByLabelText('Design basis'), { target: { value: 'Loads to ASCE/SEI 7-16.' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save changes' }));

    await waitFor(() => expect(onSaved).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/projects/3');
    expect(init?.method).toBe('PATCH');
    expect(JSON.parse(String(init?.body))).toEqual({
      name: 'Millpond barn roof',
      jobNumber: 'MB-0412',
      client: 'Tollan Farms (invented)',
      site: 'North field, Millpond',
      designBasis: 'Loads to ASCE/SEI 7-16.',
      unitSystem: 'SI',
    });
  });

  it('when the server names a field problem, then it appears under that field', async () => {
    fetchMock.mockResolvedValueOnce(
      new Response(
        JSON.stringify({ error: { code: 'job-number-taken', message: 'Job number MB-0412 is already used by another project.', fields: { jobNumber: 'Already used by another project.' } } }),
        { status: 409 },
      ),
    );
    render(
      <QueryClientProvider client={new QueryClient()}>
        <EditProjectForm project={project} onSaved={() => {}} onCancel={() => {}} />
      </QueryClientProvider>,
    );

    fireEvent.click(screen.getByRole('button', { name: 'Save changes' }));

    expect(await screen.findByText('Already used by another project.')).toBeTruthy();
    expect(screen.getByLabelText('Job number').getAttribute('aria-invalid')).toBe('true');
  });
});

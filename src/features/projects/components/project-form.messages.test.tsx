// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { projectInputSchema } from '@shared/schemas/project.schema';
import { setCsrfToken } from '@/lib/api-client';
import { CreateProjectForm } from './project-form';

// When a form speaks: no message before a field has been left or a submit tried, then the
// field's own sentence saying what to enter. The expected sentences are read from the shared
// schema the server validates with, so the form and the API say the same thing.

const fetchMock = vi.fn<typeof fetch>();

/** The message the shared schema gives for one field of a project with these values. */
function schemaMessage(field: 'jobNumber' | 'name', values: Record<string, unknown>): string {
  const result = projectInputSchema.safeParse({ name: 'Riverside depot roof', jobNumber: '24-031', ...values });
  if (result.success) throw new Error('expected the schema to refuse these values');
  const issue = result.error.issues.find((i) => i.path[0] === field);
  if (!issue) throw new Error(`no message for ${field}`);
  return issue.message;
}

function renderForm() {
  render(
    <QueryClientProvider client={new QueryClient({ defaultOptions: { mutations: { retry: false } } })}>
      <CreateProjectForm onCreated={() => {}} />
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

describe('project form messages', () => {
  it('says what to enter, not a generic refusal', () => {
    const empty = schemaMessage('jobNumber', { jobNumber: '' });
    expect(empty).toMatch(/^Enter the job number, e\.g\. /);
    expect(schemaMessage('jobNumber', { jobNumber: 'J'.repeat(41) })).toMatch(/^Shorten the job number to 40 characters/);
    expect(schemaMessage('name', { name: '' })).toMatch(/^Enter a project name, e\.g\. /);
  });

  it('when nothing has been touched, then no field shows a message', () => {
    renderForm();
    expect(screen.queryByText(schemaMessage('jobNumber', { jobNumber: '' }))).toBeNull();
    expect(screen.queryByText(schemaMessage('name', { name: '' }))).toBeNull();
    expect(screen.getByLabelText('Job number').getAttribute('aria-invalid')).toBeNull();
  });

  it('when the job number is left empty on blur, then only that field says what to enter', async () => {
    renderForm();
    const jobNumber = screen.getByLabelText('Job number');
    fireEvent.focus(jobNumber);
    fireEvent.blur(jobNumber);

    expect(await screen.findByText(schemaMessage('jobNumber', { jobNumber: '' }))).toBeTruthy();
    expect(jobNumber.getAttribute('aria-invalid')).toBe('true');
    // The project name was never touched: it stays quiet although it is empty too.
    expect(screen.queryByText(schemaMessage('name', { name: '' }))).toBeNull();
  });

  it('when typing into a field without leaving it, then it shows no message yet', async () => {
    renderForm();
    fireEvent.change(screen.getByLabelText('Job number'), { target: { value: 'J'.repeat(41) } });
    // Give the resolver a turn: nothing may appear until the field is left.
    await new Promise((r) => setTimeout(r, 20));
    expect(screen.queryByText(schemaMessage('jobNumber', { jobNumber: 'J'.repeat(41) }))).toBeNull();

    fireEvent.blur(screen.getByLabelText('Job number'));
    expect(await screen.findByText(schemaMessage('jobNumber', { jobNumber: 'J'.repeat(41) }))).toBeTruthy();
  });

  it('when submitted untouched, then every empty required field says what to enter and nothing is sent', async () => {
    renderForm();
    fireEvent.click(screen.getByRole('button', { name: /create/i }));

    expect(await screen.findByText(schemaMessage('jobNumber', { jobNumber: '' }))).toBeTruthy();
    expect(screen.getByText(schemaMessage('name', { name: '' }))).toBeTruthy();
    await waitFor(() => expect(fetchMock).not.toHaveBeenCalled());
  });
});

// @vitest-environment jsdom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { setCsrfToken } from '@/lib/api-client';
import { SignInForm } from './sign-in-form';

// The expected messages are those of the shared sign-in schema and the API error contract.

const fetchMock = vi.fn<typeof fetch>();

function renderForm(onSignedIn = vi.fn()) {
  const client = new QueryClient({ defaultOptions: { mutations: { retry: false } } });
  render(
    <QueryClientProvider client={client}>
      <SignInForm onSignedIn={onSignedIn} />
    </QueryClientProvider>,
  );
  return { onSignedIn };
}

function fill(label: string, value: string) {
  fireEvent.change(screen.getByLabelText(label), { target: { value } });
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

describe('SignInForm', () => {
  it('when submitted empty, then both fields say what is missing and nothing is sent', async () => {
    renderForm();

    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Enter an e-mail address like name@firm.com.')).toBeTruthy();
    expect(screen.getByText('Enter your password.')).toBeTruthy();
    expect(screen.getByLabelText('E-mail').getAttribute('aria-invalid')).toBe('true');
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('when the e-mail is malformed, then only the e-mail field complains', async () => {
    renderForm();
    fill('E-mail', 'engineer-at-firm');
    fill('Password', 'whatever-it-is');

    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByText('Enter an e-mail address like name@firm.com.')).toBeTruthy();
    expect(screen.queryByText('Enter your password.')).toBeNull();
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('when the server answers bad-credentials, then its message is shown and the form can be used again', async () => {
    fetchMock.mockResolvedValueOnce(
      new Response(JSON.stringify({ error: { code: 'bad-credentials', message: 'That e-mail and password do not match an account.' } }), {
        status: 401,
      }),
    );
    const { onSignedIn } = renderForm();
    fill('E-mail', ' Engineer@Firm.test ');
    fill('Password', 'wrong-password');

    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    expect((await screen.findByRole('alert')).textContent).toBe('That e-mail and password do not match an account.');
    expect(onSignedIn).not.toHaveBeenCalled();
    // The schema trims and lower-cases the address before it is sent.
    expect(JSON.parse(String(fetchMock.mock.calls[0][1]?.body))).toEqual({ email: 'engineer@firm.test', password: 'wrong-password' });
    await waitFor(() => expect((screen.getByRole('button', { name: 'Sign in' }) as HTMLButtonElement).disabled).toBe(false));
  });

  it('when the server accepts, then the new session is handed on', async () => {
    const session = {
      user: { id: 1, email: 'engineer@firm.test', name: 'Ines Ortega', role: 'engineer', disabled: false, pending: false, createdAt: '2025-01-01T00:00:00Z' },
      csrfToken: 'fresh',
    };
    fetchMock.mockResolvedValueOnce(new Response(JSON.stringify(session), { status: 200 }));
    const { onSignedIn } = renderForm();
    fill('E-mail', 'engineer@firm.test');
    fill('Password', 'right-password');

    fireEvent.click(screen.getByRole('button', { name: 'Sign in' }));

    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(session));
  });
});

import { fireEvent, screen, waitFor } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { mockFetch } from '../../../testing/fetch-mock';
import { renderWithProviders } from '../../../testing/render';
import { DemoAccounts } from './demo-accounts';
import { SignInForm } from './sign-in-form';

function fillAndSubmit(username: string, password: string) {
  fireEvent.input(screen.getByLabelText(/username/i), { target: { value: username } });
  fireEvent.input(screen.getByLabelText(/password/i), { target: { value: password } });
  fireEvent.click(screen.getByRole('button', { name: /sign in/i }));
}

function loginAnswers(answer: { status: number; body?: unknown; headers?: Record<string, string> }) {
  return mockFetch((url) => {
    if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
    if (url === '/api/auth/login') return answer;
    return { status: 404 };
  });
}

describe('SignInForm', () => {
  it('shows what is missing and calls nothing when submitted empty', async () => {
    const fetchMock = mockFetch(() => ({ status: 500 }));
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    fireEvent.click(screen.getByRole('button', { name: /sign in/i }));

    expect(await screen.findByText('Enter your username')).toBeTruthy();
    expect(screen.getByText('Enter your password')).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('says the username and password do not match on 401, without saying which', async () => {
    loginAnswers({ status: 401, body: { message: 'Unknown user' } });
    const onSignedIn = vi.fn();
    renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    fillAndSubmit('night.recorder', 'wrong password');

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain('That username and password do not match.');
    expect(alert.textContent).not.toContain('Unknown user');
    expect(onSignedIn).not.toHaveBeenCalled();
  });

  it('asks to wait the minutes from Retry-After on 429', async () => {
    loginAnswers({ status: 429, body: { message: 'Too Many Requests' }, headers: { 'retry-after': '540' } });
    renderWithProviders(<SignInForm onSignedIn={vi.fn()} />);

    fillAndSubmit('night.recorder', 'some password');

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain('Too many attempts. Try again in about 9 minutes.');
  });

  it('sends the trimmed username with the CSRF token and reports the signed-in user', async () => {
    const user = { id: 'u1', username: 'night.recorder', displayName: 'Night Recorder', roles: ['recorder'] };
    const fetchMock = loginAnswers({ status: 200, body: { user } });
    const onSignedIn = vi.fn();
    renderWithProviders(<SignInForm onSignedIn={onSignedIn} />);

    fillAndSubmit('  night.recorder ', 'correct horse battery');

    await waitFor(() => {
      expect(onSignedIn).toHaveBeenCalledWith(user);
    });
    const login = fetchMock.mock.calls.find(([url]) => url === '/api/auth/login');
    expect(login?.[1]?.body).toBe('{"username":"night.recorder","password":"correct horse battery"}');
    expect(new Headers(login?.[1]?.headers).get('x-csrf-token')).toBe('tok-1');
  });
});

describe('SignInForm with the demo accounts', () => {
  it('shows the demo panel only when enabled, and a tap fills the username', async () => {
    mockFetch((url) =>
      url === '/api/auth/demo'
        ? {
            body: {
              enabled: true,
              password: 'harbourview-demo',
              accounts: [{ username: 'ward.recorder', displayName: 'Priya Lindqvist', roles: ['recorder'] }],
            },
          }
        : { status: 404 },
    );
    renderWithProviders(
      <SignInForm onSignedIn={vi.fn()} renderHelp={(fill) => <DemoAccounts onPick={fill} />} />,
    );

    expect((await screen.findByTestId('demo-password')).textContent).toBe('harbourview-demo');
    fireEvent.click(screen.getByRole('button', { name: /Priya Lindqvist/ }));

    await waitFor(() => {
      expect(screen.getByLabelText<HTMLInputElement>(/username/i).value).toBe('ward.recorder');
    });
  });

  it('shows no demo panel when demo mode is off', async () => {
    const fetchMock = mockFetch(() => ({ body: { enabled: false } }));
    renderWithProviders(
      <SignInForm onSignedIn={vi.fn()} renderHelp={(fill) => <DemoAccounts onPick={fill} />} />,
    );

    await waitFor(() => {
      expect(fetchMock).toHaveBeenCalled();
    });
    expect(screen.queryByTestId('demo-panel')).toBeNull();
  });
});

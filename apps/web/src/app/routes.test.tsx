import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { DEFAULT_PROTOCOL } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import { mockFetch, type Responder } from '../testing/fetch-mock';
import { renderWithProviders } from '../testing/render';
import { routes, useUnauthorizedRedirect } from './router';

function TestApp({ router }: { router: ReturnType<typeof createMemoryRouter> }) {
  useUnauthorizedRedirect();
  return <RouterProvider router={router} />;
}

function renderAt(path: string, responder: Responder) {
  const fetchMock = mockFetch(responder);
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  renderWithProviders(<TestApp router={router} />);
  return { router, fetchMock };
}

const CODE_42 = {
  id: 'code-42',
  status: 'active',
  category: 'adult',
  weightKg: null,
  location: null,
  unitId: null,
  patient: null,
  arrestAt: '2026-03-04T07:42:10.000Z',
  createdAt: '2026-03-04T07:42:10.000Z',
  createdBy: 'u1',
  endedAt: null,
  outcome: null,
};

const dana = {
  id: 'u1',
  username: 'dana.okafor',
  displayName: 'Dana Okafor',
  roles: ['recorder', 'leader', 'pharmacist'],
};

function signedIn(extra: Responder = () => ({ status: 404 })): Responder {
  return (url, init) => {
    if (url === '/api/auth/me') return { body: { user: dana } };
    if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
    if (url === '/api/codes?status=active') return { body: { codes: [] } };
    return extra(url, init);
  };
}

describe('routes', () => {
  it('sends a signed-out visitor to sign in, remembering the page', async () => {
    const { router } = renderAt('/codes/c-9/record?from=wall', (url) =>
      url === '/api/auth/me'
        ? { status: 401, body: { message: 'Unauthorized' } }
        : { body: { enabled: false } },
    );

    // The first test loads the route chunks cold: give it more than the default second.
    expect(
      await screen.findByRole('heading', { level: 1, name: 'Sign in' }, { timeout: 5_000 }),
    ).toBeTruthy();
    expect(document.title).toBe('Sign in · Steadyhand');
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(new URLSearchParams(router.state.location.search).get('next')).toBe(
      '/codes/c-9/record?from=wall',
    );
  });

  it('shows one panel per role held, the live-codes panel answering to both writer roles', async () => {
    renderAt('/', signedIn());

    const heading = await screen.findByTestId('home-heading');
    expect(heading.textContent).toContain('Dana Okafor');
    expect(document.title).toBe('Home · Steadyhand');
    expect(screen.getByTestId('home-panel-recorder')).toBeTruthy();
    expect(screen.getByTestId('home-panel-leader')).toBeTruthy();
    expect(screen.getByTestId('home-panel-pharmacist').textContent).toContain(
      'Drug reconciliation',
    );
    expect(screen.queryByTestId('home-panel-reviewer')).toBeNull();
    expect(screen.queryByTestId('home-panel-admin')).toBeNull();
    expect(screen.getAllByRole('heading', { name: 'Live codes' })).toHaveLength(1);
    expect(await screen.findByTestId('live-codes-empty')).toBeTruthy();
  });

  it('starts an adult code and opens its record page', async () => {
    const { router, fetchMock } = renderAt(
      '/',
      signedIn((url) => {
        if (url === '/api/codes') return { status: 201, body: { code: { id: 'code-42' } } };
        if (url === '/api/codes/code-42') return { body: { code: CODE_42, entries: [] } };
        if (url === '/api/protocol/versions/1') return { body: { version: 1, protocol: DEFAULT_PROTOCOL } };
        return { status: 404 };
      }),
    );

    fireEvent.click(await screen.findByRole('button', { name: 'Start a code' }));
    // Adult or child first: every dose and energy follows from it.
    fireEvent.click(await screen.findByTestId('start-adult'));

    const pad = await screen.findByTestId('recorder-pad', {}, { timeout: 5_000 });
    expect(pad.getAttribute('data-code-id')).toBe('code-42');
    expect(router.state.location.pathname).toBe('/codes/code-42/record');
    const post = fetchMock.mock.calls.find(([url]) => url === '/api/codes');
    // The id is made on the device, so a retried start returns the same code.
    const body = JSON.parse(post?.[1]?.body as string) as { category: string; id: string };
    expect(body.category).toBe('adult');
    expect(body.id).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('keeps the person signed in and shows why when sign-out is refused', async () => {
    const { router } = renderAt(
      '/',
      signedIn((url) =>
        url === '/api/auth/logout'
          ? { status: 409, body: { message: '3 entries are still waiting to sync.' } }
          : { status: 404 },
      ),
    );

    fireEvent.click(await screen.findByRole('button', { name: 'Sign out' }));

    const alert = await screen.findByRole('alert');
    expect(within(alert).getByText('3 entries are still waiting to sync.')).toBeTruthy();
    expect(router.state.location.pathname).toBe('/');
  });

  it('goes to the sign-in page after signing out', async () => {
    const { router } = renderAt(
      '/',
      signedIn((url) => (url === '/api/auth/logout' ? { status: 204 } : { status: 404 })),
    );

    fireEvent.click(await screen.findByRole('button', { name: 'Sign out' }));

    await waitFor(() => {
      expect(router.state.location.pathname).toBe('/sign-in');
    });
    expect(router.state.location.search).toBe('');
  });

  it('sends the person to sign in, and back here afterwards, when a data call answers 401', async () => {
    let sessionEnded = false;
    const { router } = renderAt('/', (url) => {
      if (url === '/api/auth/me') return sessionEnded ? { status: 401 } : { body: { user: dana } };
      if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
      if (url === '/api/auth/demo') return { body: { enabled: false } };
      if (url === '/api/codes') {
        sessionEnded = true;
        return { status: 401, body: { message: 'Unauthorized' } };
      }
      return { status: 404 };
    });
    await router.navigate('/?tab=live');

    fireEvent.click(await screen.findByRole('button', { name: 'Start a code' }));
    fireEvent.click(await screen.findByTestId('start-adult'));

    expect(await screen.findByRole('heading', { level: 1, name: 'Sign in' })).toBeTruthy();
    expect(new URLSearchParams(router.state.location.search).get('next')).toBe('/?tab=live');
  });
});

import { DEFAULT_PROTOCOL, type ProtocolSettings } from '@steadyhand/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { describe, expect, it } from 'vitest';
import { Component as ProtocolPage } from '../../../app/routes/admin/protocol';
import { CurrentUserContext } from '../../../lib/session/use-current-user';
import { headerOf, mockFetch } from '../../../testing/fetch-mock';
import { renderWithProviders } from '../../../testing/render';
import { ProtocolForm, PROTOCOL_CAUTION } from './protocol-form';

const neverSaved = { protocol: DEFAULT_PROTOCOL, version: 1, updatedAt: null, updatedBy: null };

function type(label: RegExp, value: string) {
  const input = screen.getByLabelText(label);
  fireEvent.input(input, { target: { value } });
  fireEvent.blur(input);
}

// The whole catalogue renders in each test; happy-dom needs more than the default 5 s for it.
describe('ProtocolForm', { timeout: 20_000 }, () => {
  it('says what is wrong with a 5 s compression cycle and sends nothing', async () => {
    const fetchMock = mockFetch(() => ({ status: 500 }));
    renderWithProviders(<ProtocolForm document={neverSaved} />);

    type(/^Compression cycle/, '5');
    fireEvent.click(screen.getByRole('button', { name: 'Save protocol' }));

    expect(await screen.findByText('Must be at least 30')).toBeTruthy();
    expect(screen.getByLabelText<HTMLInputElement>(/^Compression cycle/).getAttribute('aria-invalid')).toBe('true');
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it("refuses a default energy that is not one of the presets, in the schema's own words", async () => {
    const fetchMock = mockFetch(() => ({ status: 500 }));
    renderWithProviders(<ProtocolForm document={neverSaved} />);

    type(/^Default energy/, '250');
    fireEvent.click(screen.getByRole('button', { name: 'Save protocol' }));

    expect(await screen.findByText(/must be one of the shock presets/)).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('shows the caution and each drug source, and PUTs the edited values with the CSRF token', async () => {
    const saved: ProtocolSettings[] = [];
    const fetchMock = mockFetch((url, init) => {
      if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
      if (url === '/api/protocol' && init?.method === 'PUT') {
        const body = JSON.parse(init.body as string) as ProtocolSettings;
        saved.push(body);
        return { body: { protocol: body, version: 2, updatedAt: '2026-03-04T07:42:10.000Z', updatedBy: 'Sofia Delacroix' } };
      }
      return { status: 404 };
    });
    renderWithProviders(<ProtocolForm document={neverSaved} />);

    expect(screen.getByTestId('protocol-caution').textContent).toContain(PROTOCOL_CAUTION);
    expect(screen.getByTestId('drug-source-0').textContent).toContain(DEFAULT_PROTOCOL.drugs[0]?.source);
    type(/^Compression cycle/, '150');
    expect(screen.getByTestId('mmss-cprCycleSeconds').textContent).toContain('2:30');
    type(/^Epinephrine due from/, '240');
    type(/^Epinephrine overdue after/, '360');
    fireEvent.click(screen.getByRole('button', { name: 'Save protocol' }));

    await waitFor(() => {
      expect(saved).toHaveLength(1);
    });
    expect(saved[0]).toEqual({ ...DEFAULT_PROTOCOL, cprCycleSeconds: 150, epinephrineWindowSeconds: { min: 240, max: 360 } });
    const put = fetchMock.mock.calls.find(([url, init]) => url === '/api/protocol' && init?.method === 'PUT');
    expect(headerOf(put?.[1], 'x-csrf-token')).toBe('tok-1');
    expect((await screen.findByTestId('protocol-notice')).textContent).toMatch(/Saved\. Last changed by Sofia Delacroix/);
  });
});

// The page alone, as the signed-in area would show it (not the whole router, which other areas share).
function renderPageAs(roles: ('recorder' | 'admin')[]) {
  const fetchMock = mockFetch((url) => (url === '/api/protocol' ? { body: neverSaved } : { status: 404 }));
  const user = { id: 'u1', username: 'x.y', displayName: 'Maren Holt, RN', roles };
  const router = createMemoryRouter([{ path: '/admin/protocol', Component: ProtocolPage }], { initialEntries: ['/admin/protocol'] });
  renderWithProviders(
    <CurrentUserContext value={user}>
      <RouterProvider router={router} />
    </CurrentUserContext>,
  );
  return fetchMock;
}

describe('the protocol settings page', { timeout: 20_000 }, () => {
  it('tells someone without the administrator role that the page needs it, and never loads the settings', async () => {
    const fetchMock = renderPageAs(['recorder']);

    expect((await screen.findByTestId('protocol-needs-admin')).textContent).toContain('This page needs the administrator role.');
    expect(screen.queryByTestId('protocol-caution')).toBeNull();
    expect(fetchMock.mock.calls.some(([url]) => url === '/api/protocol')).toBe(false);
  });

  it('opens the editor for an admin', async () => {
    renderPageAs(['admin']);

    expect(await screen.findByTestId('protocol-caution')).toBeTruthy();
    expect(screen.getByTestId('protocol-last-changed').textContent).toContain('Published defaults');
    expect(document.title).toBe('Protocol settings · Steadyhand');
  });
});

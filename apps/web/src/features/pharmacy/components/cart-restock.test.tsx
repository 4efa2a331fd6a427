import type { CartRestock, PharmacyUnit } from '@steadyhand/shared';
import { fireEvent, screen, within } from '@testing-library/react';
import { MemoryRouter } from 'react-router';
import { describe, expect, it } from 'vitest';
import { mockFetch } from '../../../testing/fetch-mock';
import { renderWithProviders } from '../../../testing/render';
import { CartRestockSection, defaultSince } from './cart-restock';

const units: PharmacyUnit[] = [
  { id: 'unit-4w', name: '4 West Medical', trayId: 'tray-1', trayName: 'Adult tray' },
  { id: 'unit-6n', name: '6 North Surgical', trayId: null, trayName: null },
];

// Strengths as on the demo tray: common practice, no published source.
const restock: CartRestock = {
  unit: { id: 'unit-4w', name: '4 West Medical' },
  tray: { id: 'tray-1', name: 'Adult tray' },
  since: '2026-11-25T00:00:00.000Z',
  until: '2026-12-02T09:00:00.000Z',
  included: [
    { codeId: 'code-a', arrestAt: '2026-11-26T07:40:00.000Z', location: '4 West Medical, bed 12' },
    { codeId: 'code-b', arrestAt: '2026-11-29T14:05:00.000Z', location: null },
  ],
  leftOut: [{ codeId: 'code-c', arrestAt: '2026-12-01T03:10:00.000Z', location: null, reason: 'not-signed-off', message: 'The reconciliation is a draft, not signed off: sign it off to count it here.' }],
  lines: [
    {
      drugKey: 'epinephrine',
      label: 'Epinephrine',
      strength: '1 mg in 10 mL',
      controlled: false,
      onTray: true,
      par: 10,
      unitsOpened: 2,
      unitsWasted: 0,
      restock: 2,
      lotsUsed: ['EP2291', 'EP2300'],
      codeIds: ['code-a', 'code-b'],
      trayLot: 'EPI-T-0411',
      trayExpiry: '2099-01-31',
      expiryNote: null,
    },
  ],
};

// The code links are router links: the section renders inside a router, as on the page.
const renderSection = () =>
  renderWithProviders(
    <MemoryRouter>
      <CartRestockSection units={units} hrefOf={(id) => `/pharmacy/codes/${id}`} />
    </MemoryRouter>,
  );

describe('CartRestockSection', () => {
  it('asks for a unit, then shows the summed lines, the codes included and left out, and the download links', async () => {
    const calls: string[] = [];
    mockFetch((url) => {
      calls.push(url);
      return url.startsWith('/api/pharmacy/carts/unit-4w/restock?') ? { body: restock } : { status: 404 };
    });
    renderSection();
    expect(screen.getByTestId<HTMLInputElement>('cart-restock-since').value).toBe(defaultSince());
    expect(screen.getByRole('option', { name: '6 North Surgical (no tray)' })).toBeTruthy();
    expect(calls).toHaveLength(0);

    fireEvent.change(screen.getByTestId('cart-restock-since'), { target: { value: '2026-11-25' } });
    fireEvent.change(screen.getByTestId('cart-restock-unit'), { target: { value: 'unit-4w' } });
    const line = await screen.findByTestId('cart-restock-line-epinephrine');
    expect(calls).toEqual(['/api/pharmacy/carts/unit-4w/restock?since=2026-11-25']);
    expect(within(line).getAllByRole('cell').map((c) => c.textContent)).toEqual(['Epinephrine', '1 mg in 10 mL', '10', '2', '0', '2', 'EP2291, EP2300', 'EPI-T-0411', '2099-01-31', '#1 #2']);
    expect(screen.getByTestId('cart-restock-included').textContent).toContain('Codes included: 2');
    expect(screen.getByTestId('cart-restock-left-out-code-c').textContent).toContain('not signed off');
    expect(screen.getByTestId('cart-restock-csv').getAttribute('href')).toBe('/api/pharmacy/carts/unit-4w/restock.csv?since=2026-11-25');
    expect(screen.getByTestId('cart-restock-pdf').getAttribute('href')).toBe('/api/pharmacy/carts/unit-4w/restock.pdf?since=2026-11-25');
  });

  it('says why there is no list for a cart without a tray', async () => {
    mockFetch(() => ({ status: 409, body: { statusCode: 409, message: 'The 6 North Surgical cart has no tray template: an admin puts one on it on the Trays page' } }));
    renderSection();
    fireEvent.change(screen.getByTestId('cart-restock-unit'), { target: { value: 'unit-6n' } });
    expect((await screen.findByRole('alert')).textContent).toContain('has no tray template');
  });
});

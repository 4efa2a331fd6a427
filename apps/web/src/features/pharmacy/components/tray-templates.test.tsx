import type { TrayTemplate, TrayTemplateInput } from '@steadyhand/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { mockFetch } from '../../../testing/fetch-mock';
import { renderWithProviders } from '../../../testing/render';
import { TrayTemplates } from './tray-templates';

const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

// Strengths as on the demo tray: common practice, no published source.
const tray: TrayTemplate = {
  id: 'tray-1',
  name: 'Adult tray',
  active: true,
  unitIds: [],
  updatedAt: '2026-12-01T08:00:00.000Z',
  items: [
    { id: 'item-epi', drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10, controlled: false, sortOrder: 0, lot: 'EPI-T-0411', expiry: inDays(-3) },
    { id: 'item-atr', drugKey: 'atropine', label: 'Atropine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 3, controlled: false, sortOrder: 1, lot: null, expiry: null },
  ],
};

function type(input: HTMLElement, value: string) {
  fireEvent.input(input, { target: { value } });
  fireEvent.blur(input);
}

describe('TrayTemplates: lot and expiry', () => {
  it('shows each item lot and expiry in the list, flagging an expired one', () => {
    mockFetch(() => ({ status: 404 }));
    renderWithProviders(<TrayTemplates trays={[tray]} units={[]} canEdit={false} />);
    const list = screen.getByTestId('tray-Adult tray');
    expect(within(list).getByText('EPI-T-0411')).toBeTruthy();
    expect(screen.getByTestId('expiry-Adult tray-epinephrine').textContent).toContain('Expired');
    expect(screen.getByTestId('expiry-Adult tray-atropine').textContent).toBe('Not recorded');
  });

  it('says what is wrong with an over-long lot, then sends the lot and expiry entered', async () => {
    const sent: TrayTemplateInput[] = [];
    mockFetch((url, init) => {
      if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
      if (url === '/api/pharmacy/trays/tray-1' && init?.method === 'PUT') {
        sent.push(JSON.parse(init.body as string) as TrayTemplateInput);
        return { body: { tray } };
      }
      return { status: 404 };
    });
    renderWithProviders(<TrayTemplates trays={[tray]} units={[]} canEdit />);
    fireEvent.click(screen.getByRole('button', { name: 'Edit Adult tray' }));

    const lots = screen.getAllByLabelText('Lot');
    const expiries = screen.getAllByLabelText('Expiry');
    type(lots[1] as HTMLElement, 'L'.repeat(41));
    fireEvent.click(screen.getByRole('button', { name: 'Save tray' }));
    expect(await screen.findByText('must be at most 40 characters')).toBeTruthy();
    expect(sent).toHaveLength(0);

    type(lots[1] as HTMLElement, ' ATR-T-1150 ');
    type(expiries[1] as HTMLElement, '2027-03-31');
    type(lots[0] as HTMLElement, '');
    fireEvent.click(screen.getByRole('button', { name: 'Save tray' }));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]?.items.map((i) => [i.id, i.lot, i.expiry])).toEqual([
      ['item-epi', null, inDays(-3)],
      ['item-atr', 'ATR-T-1150', '2027-03-31'],
    ]);
  });
});

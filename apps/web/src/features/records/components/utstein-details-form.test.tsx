import { fireEvent, screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { mockFetch } from '../../../testing/fetch-mock';
import { renderWithProviders } from '../../../testing/render';
import { UtsteinDetailsForm } from './utstein-details-form';

const ARREST = '2026-03-04T07:42:10.000Z';

describe('UtsteinDetailsForm', () => {
  it('sends only what changed, clears a detail that no longer belongs, and saves after signing as an addendum', async () => {
    const sent: unknown[] = [];
    mockFetch((url, init) => {
      if (url === '/api/auth/csrf') return { body: { token: 't' } };
      if (init?.method === 'PATCH') sent.push(JSON.parse(init.body as string));
      return { body: { code: {} } };
    });
    renderWithProviders(
      <UtsteinDetailsForm
        codeId="code-1"
        arrestAt={ARREST}
        details={{ witnessed: 'yes', witnessedBy: 'staff', cause: 'toxins' }}
        addenda={[]}
        signed
        closedAt={null}
        editable
      />,
    );
    expect(screen.getByTestId('utstein-save').textContent).toBe('Save as an addendum');
    expect(screen.getByTestId('utstein-save')).toHaveProperty('disabled', true);
    // Not witnessed: "witnessed by" leaves the form and is cleared on the server.
    fireEvent.change(screen.getByLabelText('Witnessed'), { target: { value: 'no' } });
    expect(screen.queryByLabelText('Witnessed by')).toBeNull();
    fireEvent.change(screen.getByLabelText('Monitored'), { target: { value: 'unknown' } });
    fireEvent.click(screen.getByTestId('utstein-save'));
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0]).toEqual({
      utstein: { witnessed: 'no', witnessedBy: null, monitored: 'unknown' },
    });
  });

  it('shows what does not fit before sending: a diastolic pressure above the systolic', () => {
    mockFetch(() => ({ body: {} }));
    renderWithProviders(
      <UtsteinDetailsForm
        codeId="code-1"
        arrestAt={ARREST}
        details={{}}
        addenda={[]}
        signed={false}
        closedAt={null}
        editable
      />,
    );
    fireEvent.change(screen.getByLabelText('Systolic pressure at hand-over (mmHg)'), {
      target: { value: '80' },
    });
    fireEvent.change(screen.getByLabelText('Diastolic pressure at hand-over (mmHg)'), {
      target: { value: '90' },
    });
    expect(screen.getByText('must be below the systolic pressure (80 mmHg)')).toBeTruthy();
    expect(screen.getByTestId('utstein-save')).toHaveProperty('disabled', true);
  });

  it('is closed once the quality review is signed off', () => {
    mockFetch(() => ({ body: {} }));
    renderWithProviders(
      <UtsteinDetailsForm
        codeId="code-1"
        arrestAt={ARREST}
        details={{ witnessed: 'yes' }}
        addenda={[]}
        signed
        closedAt="2026-03-10T09:00:00.000Z"
        editable={false}
      />,
    );
    expect(screen.getByTestId('utstein-closed').textContent).toMatch(
      /quality review was signed off/,
    );
    expect(screen.queryByTestId('utstein-save')).toBeNull();
  });
});

import { QueryClient } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import type { ReactElement } from 'react';
import { AppProvider } from '../app/provider';

/** Renders inside the real providers with a fresh, non-retrying query client. */
export function renderWithProviders(ui: ReactElement) {
  const queryClient = new QueryClient({
    defaultOptions: { queries: { retry: false }, mutations: { retry: false } },
  });
  return { queryClient, ...render(<AppProvider queryClient={queryClient}>{ui}</AppProvider>) };
}

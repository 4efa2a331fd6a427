import { ChakraProvider } from '@chakra-ui/react';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { queryClient as defaultQueryClient } from '../lib/query-client';
import { system } from '../theme/system';

interface AppProviderProps {
  children: ReactNode;
  /** Tests pass their own client so no cache leaks between them. */
  queryClient?: QueryClient;
}

export function AppProvider({ children, queryClient = defaultQueryClient }: AppProviderProps) {
  return (
    <ChakraProvider value={system}>
      <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
    </ChakraProvider>
  );
}

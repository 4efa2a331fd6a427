import { cleanup } from '@testing-library/react';
import { afterEach, vi } from 'vitest';
import { resetCsrfToken, setUnauthorizedHandler } from '../lib/api-client';

// Vitest runs without globals, so Testing Library cannot unmount on its own between tests.
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
  vi.restoreAllMocks();
  resetCsrfToken();
  setUnauthorizedHandler(null);
});

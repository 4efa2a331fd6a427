import { DEFAULT_PROTOCOL, type Role } from '@steadyhand/shared';
import { makeEntry } from './entries.js';
import { TEST_PASSWORD } from './test-app.js';

export type Caller = 'anonymous' | Role;

export interface RouteRule {
  /** Who may call it: everyone, any signed-in user, or these roles. */
  allowed: 'public' | 'any' | Role[];
  /** A body to send (a valid one where the route would otherwise stop at validation). */
  body?: unknown;
  /** The call ends the caller's session, so it runs on a session of its own. */
  endsSession?: boolean;
}

export const routeKey = (method: string, path: string) => `${method} ${path}`;

/** The access table. Add a row with every new route; the matrix test refuses a route without one. */
export const ROUTE_ACCESS: Record<string, RouteRule> = {
  'GET /api/health': { allowed: 'public' },
  'GET /api/time': { allowed: 'public' },
  'GET /api/auth/csrf': { allowed: 'public' },
  'GET /api/auth/demo': { allowed: 'public' },
  'POST /api/auth/login': { allowed: 'public', body: { username: 'only.recorder', password: TEST_PASSWORD }, endsSession: true },
  'GET /api/auth/me': { allowed: 'any' },
  'POST /api/auth/logout': { allowed: 'public', endsSession: true },
  'GET /api/protocol': { allowed: 'any' },
  'PUT /api/protocol': { allowed: ['admin'], body: () => DEFAULT_PROTOCOL },
  'POST /api/protocol/reset': { allowed: ['admin'] },
  'POST /api/codes': { allowed: ['recorder', 'leader'], body: { category: 'adult' } },
  'GET /api/codes': { allowed: 'any' },
  'GET /api/codes/:id': { allowed: 'any' },
  'PATCH /api/codes/:id': { allowed: ['recorder', 'leader'], body: { location: 'Emergency Bay 2' } },
  'POST /api/codes/:id/entries': { allowed: ['recorder', 'leader'], body: () => makeEntry({ kind: 'note', text: 'matrix' }) },
  'GET /api/codes/:id/dosing': { allowed: 'any' },
  'GET /api/codes/:id/summary': { allowed: 'any' },
};

import { DEFAULT_PROTOCOL, type Role } from '@steadyhand/shared';
import { makeEntry } from './entries.js';
import { tinyPng } from './sample-files.js';
import { TEST_PASSWORD } from './test-app.js';

export type Caller = 'anonymous' | Role;

export interface RouteRule {
  /** Who may call it: everyone, any signed-in user, or these roles. */
  allowed: 'public' | 'any' | Role[];
  /** A body to send (a valid one where the route would otherwise stop at validation). */
  body?: unknown;
  /** The call ends the caller's session, so it runs on a session of its own. */
  endsSession?: boolean;
  /** A file to send as multipart/form-data (upload routes), instead of a JSON body. */
  attach?: { field: string; filename: string; content: Buffer };
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
  // The second step of a sign-in: open (the half-done session has no user); answers 400 or 409 when nothing waits.
  'POST /api/auth/totp': { allowed: 'public', body: { code: '000000' } },
  // My account. Starting a second factor answers 409 to the admin (enrolled already); a wrong first code is a 400.
  'GET /api/account/sessions': { allowed: 'any' },
  'DELETE /api/account/sessions/:sessionId': { allowed: 'any' },
  // A too-short new password stops at validation (400), before any slow password hashing.
  'POST /api/account/password': { allowed: 'any', body: { currentPassword: 'not the password', newPassword: 'short' } },
  'GET /api/account/totp': { allowed: 'any' },
  'POST /api/account/totp/start': { allowed: 'any' },
  'POST /api/account/totp/confirm': { allowed: 'any', body: { code: '000000' } },
  // Admin: people, places, sessions, audit trail (the fixture person is a recorder, never the last admin).
  'GET /api/admin/users': { allowed: ['admin'] },
  'POST /api/admin/users': { allowed: ['admin'], body: () => ({ username: `matrix.${Math.random().toString(36).slice(2, 8)}`, displayName: 'Matrix Person', password: 'a long enough passphrase', roles: ['recorder'] }) },
  'PATCH /api/admin/users/:userId': { allowed: ['admin'], body: { displayName: 'Matrix Target' } },
  'PUT /api/admin/users/:userId/roles': { allowed: ['admin'], body: { roles: ['recorder'] } },
  'POST /api/admin/users/:userId/password': { allowed: ['admin'], body: { password: 'a long enough passphrase' } },
  'POST /api/admin/users/:userId/disable': { allowed: ['admin'] },
  'POST /api/admin/users/:userId/enable': { allowed: ['admin'] },
  'POST /api/admin/users/:userId/second-factor/reset': { allowed: ['admin'] },
  'GET /api/admin/sessions': { allowed: ['admin'] },
  'DELETE /api/admin/sessions/:sessionId': { allowed: ['admin'] },
  'GET /api/places': { allowed: 'any' },
  'GET /api/admin/places': { allowed: ['admin'] },
  'PUT /api/admin/places/facility': { allowed: ['admin'], body: { name: 'Harbourview General Hospital' } },
  'POST /api/admin/units': { allowed: ['admin'], body: () => ({ name: `Matrix unit ${Math.random()}` }) },
  'PATCH /api/admin/units/:unitId': { allowed: ['admin'], body: { active: true } },
  'POST /api/admin/units/:unitId/rooms': { allowed: ['admin'], body: { name: 'Matrix room' } },
  'PATCH /api/admin/rooms/:roomId': { allowed: ['admin'], body: { name: 'Room 12' } },
  'DELETE /api/admin/rooms/:roomId': { allowed: ['admin'] },
  'POST /api/admin/rooms/:roomId/beds': { allowed: ['admin'], body: { name: 'Matrix bed' } },
  'PATCH /api/admin/beds/:bedId': { allowed: ['admin'], body: { name: 'Bed 12' } },
  'DELETE /api/admin/beds/:bedId': { allowed: ['admin'] },
  'GET /api/admin/audit': { allowed: ['admin'] },
  'GET /api/admin/audit.csv': { allowed: ['admin'] },
  'GET /api/admin/backups': { allowed: ['admin'] },
  // No session: the address allowlist (METRICS_ALLOW, loopback by default) guards it; metrics.api-spec.ts holds that.
  'GET /metrics': { allowed: 'public' },
  'POST /api/auth/logout': { allowed: 'public', endsSession: true },
  'GET /api/protocol': { allowed: 'any' },
  'GET /api/protocol/versions/:version': { allowed: 'any' },
  'PUT /api/protocol': { allowed: ['admin'], body: () => DEFAULT_PROTOCOL },
  'POST /api/protocol/reset': { allowed: ['admin'] },
  'POST /api/codes': { allowed: ['recorder', 'leader'], body: { category: 'adult' } },
  'GET /api/codes': { allowed: 'any' },
  'GET /api/codes/:id': { allowed: 'any' },
  'PATCH /api/codes/:id': { allowed: ['recorder', 'leader'], body: { location: 'Emergency Bay 2' } },
  'POST /api/codes/:id/entries': { allowed: ['recorder', 'leader'], body: () => makeEntry({ kind: 'note', text: 'matrix' }) },
  'GET /api/codes/:id/dosing': { allowed: 'any' },
  'GET /api/codes/:id/summary': { allowed: 'any' },
  'GET /api/codes/:id/state': { allowed: 'any' },
  'POST /api/codes/:id/attachments': { allowed: ['recorder', 'leader'], attach: { field: 'file', filename: 'strip.png', content: tinyPng([10, 20, 30]) } },
  'GET /api/codes/:id/attachments': { allowed: 'any' },
  'GET /api/attachments/:attachmentId/content': { allowed: 'any' },
  'GET /api/dev/outbox': { allowed: ['admin'] },
  'GET /api/pharmacy/trays': { allowed: ['admin', 'pharmacist'] },
  'POST /api/pharmacy/trays': { allowed: ['admin'], body: () => ({ name: `Matrix tray ${Math.random()}`, items: [{ drugKey: 'naloxone', label: 'Naloxone', strengthAmount: 0.4, strengthUnit: 'mg', quantity: 2 }] }) },
  'PUT /api/pharmacy/trays/:trayId': { allowed: ['admin'], body: { name: 'Fixture tray', items: [{ drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10 }] } },
  'PUT /api/pharmacy/units/:unitId/tray': { allowed: ['admin'], body: { trayId: null } },
  'GET /api/pharmacy/worklist': { allowed: ['pharmacist'] },
  // The fixture unit's cart carries no tray: a pharmacist gets 409.
  'GET /api/pharmacy/carts/:unitId/restock': { allowed: ['pharmacist'] },
  'GET /api/pharmacy/carts/:unitId/restock.csv': { allowed: ['pharmacist'] },
  'GET /api/pharmacy/carts/:unitId/restock.pdf': { allowed: ['pharmacist'] },
  'GET /api/codes/:id/reconciliation': { allowed: ['pharmacist', 'recorder', 'leader'] },
  'PUT /api/codes/:id/reconciliation': { allowed: ['pharmacist'], body: { lines: [] } },
  'POST /api/codes/:id/reconciliation/sign': { allowed: ['pharmacist'], body: { password: TEST_PASSWORD } },
  'POST /api/codes/:id/reconciliation/addenda': { allowed: ['pharmacist'], body: { text: 'matrix' } },
  'GET /api/codes/:id/reconciliation/restock.csv': { allowed: ['pharmacist'] },
  'GET /api/codes/:id/reconciliation/restock.pdf': { allowed: ['pharmacist'] },
  // Reviewers and admins change only the registry details, and only of an ended code: the running fixture answers them 409.
  'PATCH /api/codes/:id/review': { allowed: ['recorder', 'leader', 'reviewer', 'admin'], body: { utstein: { witnessed: 'unknown' } } },
  // The fixture code is still running: signing and addenda answer 409 to those allowed.
  'POST /api/codes/:id/signatures': { allowed: ['recorder', 'leader'], body: { meaning: 'recorded-by', password: TEST_PASSWORD } },
  'POST /api/codes/:id/addenda': { allowed: ['recorder', 'leader'], body: () => makeEntry({ kind: 'note', text: 'matrix addendum' }) },
  'GET /api/records': { allowed: 'any' },
  'GET /api/codes/:id/record': { allowed: 'any' },
  'GET /api/codes/:id/record.pdf': { allowed: 'any' },
  'GET /api/records/public-key': { allowed: 'any' },
  'GET /api/records/public-keys': { allowed: 'any' },
  'POST /api/records/verify': { allowed: 'any', body: { digest: '0'.repeat(64) } },
  // Quality review: reviewers and admins only. The fixture code is running, so writes answer 409.
  'GET /api/quality/codes': { allowed: ['reviewer', 'admin'] },
  'GET /api/quality/stats': { allowed: ['reviewer', 'admin'] },
  'GET /api/quality/export/utstein.csv': { allowed: ['reviewer', 'admin'] },
  'GET /api/quality/codes/:id': { allowed: ['reviewer', 'admin'] },
  'PUT /api/quality/codes/:id/review': { allowed: ['reviewer', 'admin'], body: { notes: 'Matrix note' } },
  'POST /api/quality/codes/:id/review/sign': { allowed: ['reviewer', 'admin'], body: { password: TEST_PASSWORD } },
  'GET /api/quality/codes/:id/fhir': { allowed: ['reviewer', 'admin'] },
  'PUT /api/quality/codes/:id/follow-up': { allowed: ['reviewer', 'admin'], body: { survivalToDischarge: 'unknown' } },
  'GET /api/quality/follow-up': { allowed: ['reviewer', 'admin'] },
};

import type { LiveClientToServer, LiveServerToClient } from '@steadyhand/shared';
import { io, type Socket } from 'socket.io-client';
import type { SignedInAgent } from './test-app.js';

export type LiveClient = Socket<LiveServerToClient, LiveClientToServer>;

/** The session cookie a signed-in supertest agent holds, as a Cookie header. */
export function cookieHeader(signedIn: SignedInAgent, baseUrl: string): string {
  const url = new URL(baseUrl);
  const jar = (signedIn.agent as unknown as { jar: { getCookies(access: unknown): { name: string; value: string }[] } }).jar;
  const access = { domain: url.hostname, path: '/', secure: false, script: false };
  return jar
    .getCookies(access)
    .map((c) => `${c.name}=${c.value}`)
    .join('; ');
}

/** A live-socket client as a browser would open it: the session cookie and an Origin. */
export function connectLive(baseUrl: string, options: { cookie?: string; origin?: string; reconnection?: boolean } = {}): LiveClient {
  const headers: Record<string, string> = {};
  if (options.cookie) headers.cookie = options.cookie;
  if (options.origin) headers.origin = options.origin;
  return io(`${baseUrl}/live`, {
    transports: ['websocket'],
    extraHeaders: headers,
    reconnection: options.reconnection ?? false,
    forceNew: true,
  });
}

export function connected(socket: LiveClient): Promise<void> {
  return new Promise((resolve, reject) => {
    if (socket.connected) return resolve();
    socket.once('connect', () => resolve());
    socket.once('connect_error', (err) => reject(err));
  });
}

export function refused(socket: LiveClient): Promise<Error> {
  return new Promise((resolve, reject) => {
    socket.once('connect', () => reject(new Error('connected but should have been refused')));
    socket.once('connect_error', (err) => resolve(err));
  });
}

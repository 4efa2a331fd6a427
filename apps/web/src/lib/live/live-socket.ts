import {
  LIVE_NAMESPACE,
  type LiveClientToServer,
  type LiveServerToClient,
} from '@steadyhand/shared';
import { io, type Socket } from 'socket.io-client';

/**
 * One socket.io client per tab for the /live namespace. It reconnects for ever with backoff
 * while the browser says it is online; when the browser says it is offline it stops trying
 * (and drops a link that would otherwise linger until the ping timeout) and reconnects at once
 * when the network returns.
 */

export type LiveSocket = Socket<LiveServerToClient, LiveClientToServer>;

export interface LinkState {
  connected: boolean;
  /** The browser reports no network at all. */
  browserOffline: boolean;
  /** Last time anything arrived from the server (connect, ping, event, ack), device ms. */
  lastContactAt: number | null;
  /** Why the server refused the connection, when it did (for example signed out). */
  refusal: string | null;
}

type Listener = (state: LinkState) => void;

class LiveLink {
  readonly socket: LiveSocket;
  private state: LinkState;
  private readonly listeners = new Set<Listener>();
  private retryTimer: ReturnType<typeof setTimeout> | null = null;
  private started = false;

  constructor() {
    this.socket = io(LIVE_NAMESPACE, {
      transports: ['websocket', 'polling'],
      autoConnect: false,
      reconnection: true,
      reconnectionAttempts: Infinity,
      reconnectionDelay: 500,
      reconnectionDelayMax: 5000,
      randomizationFactor: 0.3,
      withCredentials: true,
    });
    this.state = {
      connected: false,
      browserOffline: !navigator.onLine,
      lastContactAt: null,
      refusal: null,
    };

    this.socket.on('connect', () => {
      this.update({ connected: true, lastContactAt: Date.now(), refusal: null });
    });
    this.socket.on('disconnect', () => {
      this.update({ connected: false });
    });
    this.socket.on('connect_error', (err) => {
      this.update({
        connected: false,
        refusal: /unauthori|origin/i.test(err.message) ? err.message : null,
      });
      // A refusal by the server's middleware is not retried by socket.io itself.
      if (!this.socket.active) this.scheduleRetry(5000);
    });
    this.socket.io.on('ping', () => this.touch());
    this.socket.onAny(() => this.touch());
  }

  start(): void {
    if (this.started) return;
    this.started = true;
    window.addEventListener('online', this.onOnline);
    window.addEventListener('offline', this.onOffline);
    if (navigator.onLine) this.socket.connect();
  }

  getState(): LinkState {
    return this.state;
  }

  subscribe(listener: Listener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Something arrived from the server. */
  touch(): void {
    this.state = { ...this.state, lastContactAt: Date.now() };
    // Contact times are read on the next tick; no need to re-render for each ping.
  }

  private readonly onOnline = () => {
    this.update({ browserOffline: false });
    // Skip the remaining backoff: the network is back now.
    if (!this.socket.connected) {
      this.socket.disconnect();
      this.socket.connect();
    }
  };

  private readonly onOffline = () => {
    this.update({ browserOffline: true, connected: false });
    this.socket.disconnect();
  };

  private scheduleRetry(ms: number): void {
    if (this.retryTimer !== null) return;
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      if (navigator.onLine && !this.socket.connected && !this.socket.active) this.socket.connect();
    }, ms);
  }

  private update(patch: Partial<LinkState>): void {
    this.state = { ...this.state, ...patch };
    for (const l of this.listeners) l(this.state);
  }
}

let link: LiveLink | null = null;

/** The tab's live link, created and started on first use. */
export function getLiveLink(): LiveLink {
  if (!link) link = new LiveLink();
  link.start();
  return link;
}

export type { LiveLink };

import { createServer, connect, type Server, type Socket } from 'node:net';

/** A small seeded PRNG (mulberry32): the same seed gives the same sequence of draws. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A seed from the environment variable when given (to replay a failure), otherwise a fresh one. */
export function seedFrom(envName: string): number {
  const given = process.env[envName];
  if (given !== undefined && given !== '') {
    const n = Number(given);
    if (!Number.isInteger(n)) throw new Error(`${envName} must be an integer, got ${given}`);
    return n >>> 0;
  }
  return Math.floor(Math.random() * 2 ** 32);
}

export interface ChaosProxyOptions {
  /** The server's port on 127.0.0.1. */
  targetPort: number;
  seed: number;
  /** Chance that one chunk from the server is lost: both sides are cut instead of forwarding it. */
  dropChance?: number;
  /** Mean lifetime of a connection before it is reset (exponentially distributed). */
  resetMeanMs?: number;
  /** Chaos lasts at most this long after the proxy starts; plain forwarding afterwards. */
  durationMs?: number;
  /** Chaos stops after this many faults (resets plus drops). */
  maxFaults?: number;
}

export interface ChaosStats {
  connections: number;
  /** Connections that could not reach the server (it was down). */
  refused: number;
  resets: number;
  drops: number;
  forwardedChunks: number;
}

export interface ChaosProxy {
  readonly port: number;
  /** http://127.0.0.1:<port>: where clients connect instead of the server. */
  readonly url: string;
  readonly seed: number;
  readonly stats: ChaosStats;
  /** False once the time or fault budget is spent, or after calm(). */
  readonly chaotic: boolean;
  /** Ends the chaos now; connections are forwarded untouched from here on. */
  calm(): void;
  close(): Promise<void>;
}

/** Cuts a connection with a TCP reset where possible, as a dropped network link or a dead NAT does. */
function cut(socket: Socket): void {
  if (socket.destroyed) return;
  try {
    socket.resetAndDestroy();
  } catch {
    socket.destroy();
  }
}

/**
 * A TCP proxy on 127.0.0.1 between the clients and the server that resets connections at random
 * and loses chunks the server sends (cutting the connection instead of forwarding them, so the
 * acknowledgements in flight are lost). The draws come from a seeded PRNG so a failure can be
 * replayed with the same seed (as far as the timing of events repeats). Chaos is bounded in time
 * and in faults; after that the proxy forwards faithfully so the clients can converge.
 */
export async function startChaosProxy(options: ChaosProxyOptions): Promise<ChaosProxy> {
  const random = seededRandom(options.seed);
  const dropChance = options.dropChance ?? 0.01;
  const resetMeanMs = options.resetMeanMs ?? 3000;
  const maxFaults = options.maxFaults ?? 60;
  const chaosUntil = Date.now() + (options.durationMs ?? 30_000);
  const stats: ChaosStats = { connections: 0, refused: 0, resets: 0, drops: 0, forwardedChunks: 0 };
  const open = new Set<Socket>();
  let calmed = false;

  const chaotic = () => !calmed && Date.now() < chaosUntil && stats.resets + stats.drops < maxFaults;

  const server: Server = createServer((client) => {
    stats.connections++;
    const upstream = connect({ host: '127.0.0.1', port: options.targetPort });
    open.add(client);
    open.add(upstream);
    let upstreamConnected = false;
    let resetTimer: NodeJS.Timeout | undefined;

    const cutBoth = () => {
      if (resetTimer) clearTimeout(resetTimer);
      cut(client);
      cut(upstream);
    };
    const closeBoth = () => {
      if (resetTimer) clearTimeout(resetTimer);
      client.destroy();
      upstream.destroy();
    };

    client.on('error', closeBoth);
    upstream.on('error', () => {
      if (!upstreamConnected) stats.refused++;
      closeBoth();
    });
    client.on('close', () => {
      open.delete(client);
      closeBoth();
    });
    upstream.on('close', () => {
      open.delete(upstream);
      closeBoth();
    });
    upstream.on('connect', () => {
      upstreamConnected = true;
    });

    // Backpressure both ways, so a slow reader slows the writer instead of growing a buffer.
    client.on('data', (chunk: Buffer) => {
      if (!upstream.write(chunk)) client.pause();
    });
    upstream.on('drain', () => client.resume());
    upstream.on('data', (chunk: Buffer) => {
      if (chaotic() && random() < dropChance) {
        stats.drops++;
        cutBoth();
        return;
      }
      stats.forwardedChunks++;
      if (!client.write(chunk)) upstream.pause();
    });
    client.on('drain', () => upstream.resume());

    if (chaotic()) {
      const lifetime = -Math.log(1 - random()) * resetMeanMs;
      resetTimer = setTimeout(() => {
        if (!chaotic() || client.destroyed) return;
        stats.resets++;
        cutBoth();
      }, lifetime);
    }
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve());
  });
  const address = server.address();
  if (typeof address !== 'object' || !address) throw new Error('the chaos proxy has no address');
  const port = address.port;
  process.stdout.write(
    `chaos proxy on 127.0.0.1:${port} -> ${options.targetPort}, seed ${options.seed}, drop chance ${dropChance}, mean reset ${resetMeanMs} ms, at most ${maxFaults} faults\n`,
  );

  return {
    port,
    url: `http://127.0.0.1:${port}`,
    seed: options.seed,
    stats,
    get chaotic() {
      return chaotic();
    },
    calm() {
      calmed = true;
    },
    async close() {
      calmed = true;
      for (const socket of open) socket.destroy();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

import { BlockList, isIP } from 'node:net';
import { ForbiddenException, Inject, Injectable } from '@nestjs/common';
import { collectDefaultMetrics, Counter, Gauge, Histogram, Registry } from 'prom-client';
import { listCopies } from '../backups/backup-copy.js';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';

export const PROMETHEUS_CONTENT_TYPE = 'text/plain; version=0.0.4; charset=utf-8';

/** An allowlist from METRICS_ALLOW entries (addresses and CIDR ranges, checked at start). */
export function allowList(items: readonly string[]): BlockList {
  const list = new BlockList();
  for (const item of items) {
    const [address, bits] = item.split('/') as [string, string | undefined];
    const type = isIP(address) === 6 ? 'ipv6' : 'ipv4';
    if (bits === undefined) list.addAddress(address, type);
    else list.addSubnet(address, Number(bits), type);
  }
  return list;
}

/** Whether an address is on the list; an IPv4 address seen as IPv6 (::ffff:a.b.c.d) counts as IPv4. */
export function addressAllowed(list: BlockList, address: string | undefined): boolean {
  if (!address) return false;
  const plain = /^::ffff:(\d{1,3}(?:\.\d{1,3}){3})$/i.exec(address)?.[1] ?? address;
  const family = isIP(plain);
  if (!family) return false;
  return list.check(plain, family === 6 ? 'ipv6' : 'ipv4');
}

/**
 * The addresses a request speaks for: the peer, and every client a proxy names in
 * X-Forwarded-For, X-Real-IP or Forwarded. All must be allowed, so a request relayed by a proxy on
 * loopback from someone outside is refused whatever TRUST_PROXY says.
 */
export function requestAddresses(peer: string | undefined, headers: Record<string, string | string[] | undefined>): (string | undefined)[] {
  const text = (v: string | string[] | undefined) => (Array.isArray(v) ? v.join(',') : (v ?? ''));
  const list = (v: string | string[] | undefined) => text(v).split(',').map((s) => s.trim()).filter(Boolean);
  // Forwarded: for=192.0.2.60, for="[2001:db8::1]:4711", for="192.0.2.1:8080"; anything else is not an address and is refused.
  const forwarded = [...text(headers.forwarded).matchAll(/for=("[^"]*"|[^;,\s]*)/gi)].map((m) => {
    const value = m[1]!.replace(/^"|"$/g, '');
    const bracketed = /^\[([^\]]+)\]/.exec(value)?.[1];
    return bracketed ?? value.replace(/^(\d{1,3}(?:\.\d{1,3}){3}):\d+$/, '$1');
  });
  return [peer, ...list(headers['x-forwarded-for']), ...list(headers['x-real-ip']), ...forwarded];
}

/**
 * The server's Prometheus metrics (GET /metrics, text format): taps stored and resent, live
 * sockets, tap-to-commit time, backups and their checks, and the process (CPU, memory, event loop).
 * One registry per app, so several servers in one test process never share counters.
 */
@Injectable()
export class MetricsService {
  readonly registry = new Registry();
  private readonly allow: BlockList;

  readonly entriesStored = new Counter({
    name: 'steadyhand_entries_stored_total',
    help: 'Entries committed to the log (new rows), by whether a device sent them back to a restored server',
    labelNames: ['refilled'] as const,
    registers: [this.registry],
  });
  readonly resends = new Counter({
    name: 'steadyhand_entry_resends_total',
    help: 'Entries sent again that the log held already (answered with the stored row, nothing doubled)',
    registers: [this.registry],
  });
  readonly socketsOpen = new Gauge({ name: 'steadyhand_live_sockets', help: 'Live socket connections open now', registers: [this.registry] });
  readonly socketConnections = new Counter({ name: 'steadyhand_live_connections_total', help: 'Live socket connections accepted', registers: [this.registry] });
  readonly tapToCommit = new Histogram({
    name: 'steadyhand_tap_to_commit_seconds',
    help: "From the tap (the entry's time, on the server clock by the device's measured offset) to its commit; entries sent live only",
    buckets: [0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10, 30, 60, 300],
    registers: [this.registry],
  });
  readonly receiveToCommit = new Histogram({
    name: 'steadyhand_entry_commit_seconds',
    help: 'From the server receiving an entry to its commit (validation, checks, the SQLite transaction)',
    buckets: [0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 1],
    registers: [this.registry],
  });
  readonly backups = new Counter({
    name: 'steadyhand_backups_total',
    help: 'Database copies made by the server, by the result of their check (ok, failed, error when no copy was made)',
    labelNames: ['result'] as const,
    registers: [this.registry],
  });

  constructor(@Inject(APP_CONFIG) config: AppConfig) {
    this.allow = allowList(config.metricsAllow);
    const backupDir = config.backup.dir;
    // Read from BACKUP_DIR at each scrape (once for the three gauges), so copies made by
    // `pnpm db:backup` count too.
    let listed: { at: number; copies: ReturnType<typeof listCopies> } = { at: 0, copies: [] };
    const copies = () => {
      if (Date.now() - listed.at > 1000) listed = { at: Date.now(), copies: listCopies(backupDir) };
      return listed.copies;
    };
    const newest = () => copies()[0];
    new Gauge({
      name: 'steadyhand_backup_last_timestamp_seconds',
      help: 'When the newest copy in BACKUP_DIR was taken (0 when there is none)',
      registers: [this.registry],
      collect() {
        const copy = newest();
        this.set(copy ? Date.parse(copy.createdAt) / 1000 : 0);
      },
    });
    new Gauge({
      name: 'steadyhand_backup_last_check_ok',
      help: "1 when the newest copy's check passed (integrity, every entry chain, attachments), else 0",
      registers: [this.registry],
      collect() {
        this.set(newest()?.check?.ok ? 1 : 0);
      },
    });
    new Gauge({
      name: 'steadyhand_backup_copies',
      help: 'Copies kept in BACKUP_DIR',
      registers: [this.registry],
      collect() {
        this.set(copies().length);
      },
    });
    collectDefaultMetrics({ register: this.registry });
  }

  /** The metrics text, for a request from allowed addresses only (METRICS_ALLOW). */
  async scrape(addresses: (string | undefined)[]): Promise<string> {
    const refused = addresses.find((a) => !addressAllowed(this.allow, a));
    if (addresses.length === 0 || refused !== undefined || addresses.includes(undefined)) {
      throw new ForbiddenException(`Metrics are served only to the addresses in METRICS_ALLOW; ${refused ?? 'this address'} is not one of them`);
    }
    return this.registry.metrics();
  }

  /** A new entry committed: count it, and time it unless it is a refill or an addendum (their tap was long ago). */
  entryCommitted(entry: { at: string; receivedAt: string; recordedAt: string; addendum: boolean }, refilled: boolean): void {
    this.entriesStored.inc({ refilled: refilled ? 'true' : 'false' });
    const committed = Date.parse(entry.recordedAt);
    this.receiveToCommit.observe(Math.max(0, committed - Date.parse(entry.receivedAt)) / 1000);
    if (!refilled && !entry.addendum) this.tapToCommit.observe(Math.max(0, committed - Date.parse(entry.at)) / 1000);
  }
}

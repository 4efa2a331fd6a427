import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../src/config/config.js';
import { makeEntry } from './support/entries.js';
import { addUser, signIn, startTestApp, tempDataDir, type SignedInAgent, type TestApp } from './support/test-app.js';

/** One sample's value from the Prometheus text, or undefined when the line is not there. */
function sample(text: string, name: string): number | undefined {
  const line = text.split('\n').find((l) => l.startsWith(`${name} `));
  return line === undefined ? undefined : Number(line.slice(name.length + 1));
}

describe('GET /metrics', () => {
  let app: TestApp;
  let recorder: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'rec.metrics', ['recorder']);
    recorder = await signIn(app, 'rec.metrics');
  }, 60_000);
  afterAll(() => app.close());

  it('serves the Prometheus text to loopback, without a session, and counts taps, resends and their commit times', async () => {
    const before = await request(app.baseUrl).get('/metrics').expect(200);
    expect(before.headers['content-type']).toMatch(/^text\/plain;.*version=0\.0\.4/);
    expect(before.text).toContain('# TYPE steadyhand_tap_to_commit_seconds histogram');
    expect(before.text).toContain('# TYPE process_cpu_seconds_total counter');
    expect(sample(before.text, 'steadyhand_backup_copies')).toBe(0);

    const code = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'adult' }).expect(201);
    const entry = makeEntry({ kind: 'cpr', action: 'start' });
    const path = `/api/codes/${code.body.code.id as string}/entries`;
    await recorder.agent.post(path).set('x-csrf-token', recorder.csrf).send(entry).expect(201);
    await recorder.agent.post(path).set('x-csrf-token', recorder.csrf).send(entry).expect(200);

    const after = (await request(app.baseUrl).get('/metrics').expect(200)).text;
    expect(sample(after, 'steadyhand_entries_stored_total{refilled="false"}')).toBe(1);
    expect(sample(after, 'steadyhand_entry_resends_total')).toBe(1);
    expect(sample(after, 'steadyhand_tap_to_commit_seconds_count')).toBe(1);
    expect(sample(after, 'steadyhand_entry_commit_seconds_count')).toBe(1);
  });

  it('refuses a request relayed for an address outside the allowlist, whatever the proxy headers say', async () => {
    const relayed = await request(app.baseUrl).get('/metrics').set('X-Forwarded-For', '203.0.113.9').expect(403);
    expect(relayed.body.message).toContain('203.0.113.9');
    await request(app.baseUrl).get('/metrics').set('Forwarded', 'for="[2001:db8::7]:4711"').expect(403);
    await request(app.baseUrl).get('/metrics').set('X-Forwarded-For', 'unknown').expect(403);
    await request(app.baseUrl).get('/metrics').set('X-Forwarded-For', '127.0.0.1').expect(200);
  });

  it('refuses loopback when METRICS_ALLOW names only another network, and a malformed METRICS_ALLOW stops the start', async () => {
    const other = await startTestApp({ env: { METRICS_ALLOW: '10.20.0.0/16, 192.0.2.7' } });
    try {
      const res = await request(other.baseUrl).get('/metrics').expect(403);
      expect(res.body.message).toMatch(/METRICS_ALLOW/);
      expect(res.text).not.toContain('steadyhand_');
    } finally {
      await other.close();
    }
    expect(() => loadConfig({ DATA_DIR: tempDataDir(), METRICS_ALLOW: '10.0.0.0/40' })).toThrow(/METRICS_ALLOW: "10.0.0.0\/40"/);
    expect(() => loadConfig({ DATA_DIR: tempDataDir(), METRICS_ALLOW: 'localhost' })).toThrow(/METRICS_ALLOW/);
  });
});

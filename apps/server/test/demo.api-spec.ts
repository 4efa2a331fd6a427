import { csvRecords } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../src/demo/demo-data.js';
import { DemoService } from '../src/demo/demo.service.js';
import { signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';

interface ListedRecord {
  code: { id: string; location: string | null; status: string };
  status: string;
}

describe('the demo hospital', () => {
  let app: TestApp;
  let recorder: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp({ env: { STEADYHAND_DEMO: '1' } });
    expect(await app.app.get(DemoService).seedIfEmpty()).toBe(true);
    recorder = await signIn(app, 'maren.holt', DEMO_PASSWORD);
  }, 120_000);
  afterAll(() => app.close());

  it('loads past codes through the real services: one waiting to be signed, four signed that verify', async () => {
    const list = (await recorder.agent.get('/api/records').expect(200)).body
      .records as ListedRecord[];
    expect(list.map((r) => [r.code.location, r.status])).toEqual([
      ['4 West Medical, bed 12', 'draft'],
      ['Cardiac Step-Down 3B, room 7', 'signed'],
      ['Pediatric Ward 5 East, bed 3', 'signed'],
      ['Emergency Bay 2, resuscitation bay 1', 'signed'],
      ['Intensive Care 6 North, bed 4', 'signed'],
    ]);

    // The brief's scenario: arrest 07:42:10, compressions 07:42:25, VF 07:43:40, shock, epinephrine
    // 07:47:55, ROSC 07:58:30, ended 08:05 (derived arithmetic on those clock times).
    const fourWest = list[0]!.code.id;
    const summary = (await recorder.agent.get(`/api/codes/${fourWest}/summary`).expect(200)).body;
    expect(summary.intervals).toMatchObject({
      arrestToFirstCompressions: 15,
      arrestToFirstRhythmAnalysis: 90,
      arrestToFirstShock: 95,
      arrestToFirstEpinephrine: 345,
      arrestToFirstRosc: 980,
      arrestToEnd: 22 * 60 + 50,
    });
    expect(summary.firstRhythm).toBe('vf');

    for (const signed of list.slice(1)) {
      const record = (await recorder.agent.get(`/api/codes/${signed.code.id}/record`).expect(200))
        .body;
      expect(
        record.signatures.map((s: { meaning: string; valid: boolean }) => [s.meaning, s.valid]),
      ).toEqual([
        ['recorded-by', true],
        ['reviewed-confirmed', true],
      ]);
      const verified = await recorder.agent
        .post('/api/records/verify')
        .set('x-csrf-token', recorder.csrf)
        .send({ digest: record.digest })
        .expect(200);
      expect(verified.body.valid).toBe(true);
    }
  });

  it('gives the reviewer registry details, follow-ups and codes still waiting for theirs', async () => {
    const reviewer = await signIn(app, 'ewan.trelawny', DEMO_PASSWORD);
    const waiting = (await reviewer.agent.get('/api/quality/follow-up').expect(200)).body as {
      items: { location: string; daysSinceArrest: number }[];
    };
    // Oldest first: the 5 East code (9 calendar days ago) is still in hospital; 4 West ended yesterday.
    // Whole days since the arrest, so the time of day decides between 8 and 9, 0 and 1.
    expect(waiting.items.map((i) => i.location)).toEqual(['Pediatric Ward 5 East, bed 3', '4 West Medical, bed 12']);
    expect([8, 9]).toContain(waiting.items[0]!.daysSinceArrest);
    expect([0, 1]).toContain(waiting.items[1]!.daysSinceArrest);
    const csv = csvRecords((await reviewer.agent.get('/api/quality/export/utstein.csv').expect(200)).text);
    const row = csv.find((r) => r.location === 'Emergency Bay 2, resuscitation bay 1')!;
    expect(row).toMatchObject({ witnessed: 'yes', monitored: 'yes', survival_to_discharge: 'yes', neurological_outcome: 'cpc-1', follow_up_complete: 'yes', destination: 'cath-lab' });
    const stats = (await reviewer.agent.get('/api/quality/stats').expect(200)).body as { overall: { rosc: { count: number; known: number }; survivalToDischarge: { count: number; known: number } } };
    expect(stats.overall.rosc).toMatchObject({ count: 4, known: 5 });
    expect(stats.overall.survivalToDischarge).toMatchObject({ count: 1, known: 3 });
  });

  it('loads only into an empty database', async () => {
    expect(await app.app.get(DemoService).seedIfEmpty()).toBe(false);
    const list = (await recorder.agent.get('/api/records').expect(200)).body
      .records as ListedRecord[];
    expect(list).toHaveLength(5);
  });
});

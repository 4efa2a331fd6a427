#!/usr/bin/env node
// Time to make the PDF record of a 90-minute code with 600 entries, beside its floor, in one run.
//
//   node bench/pdf-record.mjs [--runs 15] [--warmup 2] [--parts]
//
// Uses the built server modules (apps/server/dist; build the shared package and the server
// first). "record" is what GET /api/codes/:id/record.pdf does after reading the database: the
// canonical digest (RFC 8785 + SHA-256), the summary, the Ed25519 stamp, the layout and the
// rendering. The floor is a bare pdfmake document holding only the same 600-row timeline table,
// same font, no header, footer, summary or signatures: what any pdfmake record of this code pays.
// The two alternate within each run so both see the same machine state. Results go to
// bench/results/pdf-record-<date>.json (git-ignored).
import { randomUUID } from 'node:crypto';
import { createHash, generateKeyPairSync, sign } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DIST = path.join(ROOT, 'apps/server/dist/records');
const require = createRequire(path.join(ROOT, 'apps/server/package.json'));

const { values: args } = parseArgs({
  options: { runs: { type: 'string', default: '15' }, warmup: { type: 'string', default: '2' }, parts: { type: 'boolean', default: false } },
});
const RUNS = Number(args.runs);
const WARMUP = Number(args.warmup);

const { buildRecordPdf, renderPdf, describeEntry, sinceArrest } = await import(pathToFileURL(path.join(DIST, 'record-pdf.js')).href);
const { recordDigest, pdfStampText, formatPdfStamp, RECORD_FORMAT } = await import(pathToFileURL(path.join(DIST, 'record-canonical.js')).href);
const { CHAIN_START, entryLinkHash } = await import(pathToFileURL(path.join(DIST, '../codes/entry-chain.js')).href);
const shared = await import(pathToFileURL(require.resolve('@steadyhand/shared')).href);
const { DEFAULT_PROTOCOL, foldLog, summarize, effectiveEntries, codePicture, codePictureSvg } = shared;

// --- a 90-minute code with 600 entries ---------------------------------------------------------

const ARREST_MS = Date.parse('2026-03-04T07:42:10.000Z');
const PEOPLE = [randomUUID(), randomUUID(), randomUUID()];
const people = new Map([[PEOPLE[0], 'Maren Holt, RN'], [PEOPLE[1], 'Dr Kofi Asante'], [PEOPLE[2], 'Jonah Pell, RN']]);

function makeCode() {
  const entries = [];
  let cursor = 1000;
  const push = (sinceS, fields) => {
    const at = new Date(ARREST_MS + sinceS * 1000).toISOString();
    const recordedAt = new Date(ARREST_MS + sinceS * 1000 + 350).toISOString();
    const userId = PEOPLE[entries.length % 3];
    entries.push({ id: randomUUID(), at, deviceId: `tablet-${(entries.length % 2) + 1}`, seq: entries.length + 1, offsetMs: -120, offsetUncertaintyMs: 5, ...fields, codeId: 'bench', userId, cursor: cursor++, receivedAt: recordedAt, recordedAt, addendum: false });
    return entries[entries.length - 1];
  };
  // Two-minute cycles for 90 minutes: compressions, swap, ETCO2, stop, rhythm check, shock
  // or drug, restart, plus notes, labs and corrections, until 600 entries.
  let t = 15;
  push(t, { kind: 'cpr', action: 'start' });
  let cycle = 0;
  while (entries.length < 596) {
    const base = 15 + cycle * 120;
    push(base + 30, { kind: 'etco2', mmHg: 18 + (cycle % 9) });
    push(base + 60, { kind: 'cpr', action: 'swap' });
    push(base + 75, { kind: 'note', text: `Cycle ${cycle + 1}: compressions checked, depth and rate on target.` });
    if (cycle % 4 === 1) push(base + 80, { kind: 'lab', name: 'Potassium', value: 4.1 + (cycle % 3) / 10, unit: 'mmol/L' });
    push(base + 113, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' });
    const rhythm = push(base + 115, { kind: 'rhythm', rhythm: cycle % 3 === 2 ? 'pea' : 'vf', pulse: false });
    if (rhythm.rhythm === 'vf') push(base + 118, { kind: 'shock', joules: cycle < 2 ? 200 : 300, synchronized: false });
    push(base + 120, { kind: 'cpr', action: 'start' });
    if (cycle % 2 === 0) {
      const epi = push(base + 125, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: cycle % 4 === 0 ? 'iv' : 'io' });
      if (cycle % 10 === 4) push(base + 140, { kind: 'amend', target: epi.id, changes: { route: 'iv' }, reason: 'Route misread' });
    }
    if (cycle === 1 || cycle === 3) push(base + 127, { kind: 'drug', drug: 'amiodarone', dose: cycle === 1 ? 300 : 150, unit: 'mg', route: 'iv' });
    if (cycle % 7 === 3) {
      const n = push(base + 90, { kind: 'note', text: 'Entered on the wrong tablet.' });
      push(base + 95, { kind: 'void', target: n.id, reason: 'Duplicate tap' });
    }
    cycle++;
  }
  push(89 * 60, { kind: 'cpr', action: 'stop', reason: 'rosc' });
  push(89 * 60 + 5, { kind: 'rosc' });
  while (entries.length < 599) push(89 * 60 + 10, { kind: 'note', text: 'Post-ROSC care started.' });
  push(90 * 60, { kind: 'end', outcome: 'transferred' });
  entries.sort((a, b) => a.cursor - b.cursor);
  return {
    format: RECORD_FORMAT,
    facility: 'Harbourview General Hospital',
    code: {
      id: randomUUID(), status: 'ended', category: 'adult', weightKg: null, location: '4 West Medical, bed 12', unitId: null, patient: null,
      arrestAt: new Date(ARREST_MS).toISOString(), createdAt: new Date(ARREST_MS).toISOString(), createdBy: PEOPLE[0],
      endedAt: entries.at(-1).at, outcome: 'transferred', team: [{ name: 'Dr Kofi Asante', role: 'Team leader' }], debriefNotes: 'Bench code.',
    },
    entries,
    attachments: [],
  };
}

const record = makeCode();
// The PDF prints the chain's head beside the digest.
const chain = { valid: true, length: record.entries.length, head: record.entries.reduce((prev, e) => entryLinkHash(prev, e), CHAIN_START) };
const { privateKey, publicKey } = generateKeyPairSync('ed25519');
const keyId = createHash('sha256').update(publicKey.export({ format: 'der', type: 'spki' })).digest('hex').slice(0, 16);

async function recordPdf() {
  const digest = recordDigest(record);
  const timeline = foldLog(record.code, record.entries, DEFAULT_PROTOCOL);
  const generatedAt = new Date().toISOString();
  const signature = sign(null, Buffer.from(pdfStampText({ recordId: record.code.id, digest, generatedAt })), privateKey).toString('base64url');
  return renderPdf(
    buildRecordPdf({
      record, digest, chain, integrity: { valid: true, problems: [] }, status: 'draft', timeline, signatures: [], people, timeZone: 'UTC', generatedAt, keyId,
      stamp: formatPdfStamp({ recordId: record.code.id, digest, signature, generatedAt, keyId }),
    }),
  );
}

// The floor: its own pdfmake instance (the shared one carries the record's settings), same font.
const sharedPdfmake = require('pdfmake');
const bare = new sharedPdfmake.constructor();
const font = (w) => require.resolve(`@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-${w}-normal.woff`);
bare.addFonts({ Atkinson: { normal: font(400), bold: font(700), italics: font(400), bolditalics: font(700) } });
bare.setUrlAccessPolicy(() => false);
bare.setLocalAccessPolicy(() => true);
// The same floor with the fonts prepared as the record prepares them (unpacked once, in memory):
// shown beside the plain floor so the gain from the fonts is not hidden in the ratio.
const { woffToSfnt } = await import(pathToFileURL(path.join(DIST, 'pdf-fonts.js')).href);
const { readFileSync } = await import('node:fs');
const bareFonts = new sharedPdfmake.constructor();
bareFonts.virtualfs.writeFileSync('AtkinsonHyperlegible-Regular', woffToSfnt(readFileSync(font(400))));
bareFonts.virtualfs.writeFileSync('AtkinsonHyperlegible-Bold', woffToSfnt(readFileSync(font(700))));
bareFonts.addFonts({ Atkinson: { normal: 'AtkinsonHyperlegible-Regular', bold: 'AtkinsonHyperlegible-Bold', italics: 'AtkinsonHyperlegible-Regular', bolditalics: 'AtkinsonHyperlegible-Bold' } });
bareFonts.setUrlAccessPolicy(() => false);
bareFonts.setLocalAccessPolicy(() => false);
const clock = new Intl.DateTimeFormat('en-GB', { timeZone: 'UTC', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' });
const rows = effectiveEntries(record.entries).map((e) => {
  const d = describeEntry(e, DEFAULT_PROTOCOL);
  return [clock.format(new Date(e.at)), sinceArrest((Date.parse(e.at) - ARREST_MS) / 1000), d.what, d.details, people.get(e.userId) ?? '', e.deviceId ?? ''];
});
// The same picture, laid out once outside the timing: the floor pays only for drawing it.
const pictureSvg = codePictureSvg(codePicture(foldLog(record.code, record.entries, DEFAULT_PROTOCOL), { width: 523, scale: 0.85 }), { font: 'Atkinson' });
function barePdf(instance = bare) {
  return instance
    .createPdf({
      pageSize: 'A4',
      content: [{ svg: pictureSvg, width: 523 }, { table: { headerRows: 1, widths: [46, 44, 90, '*', 82, 50], body: [['Clock time', 'Since arrest', 'What', 'Details', 'Recorded by', 'Device'], ...rows] }, fontSize: 8 }],
      defaultStyle: { font: 'Atkinson', fontSize: 9 },
    })
    .getBuffer();
}

// --- run ---------------------------------------------------------------------------------------

const timings = { record: [], bare: [], bareFonts: [] };
const cpuTimes = { record: [], bare: [], bareFonts: [] };
const bytes = { record: 0, bare: 0, bareFonts: 0 };
let pages = { record: 0, bare: 0, bareFonts: 0 };
const bareFontsPdf = () => barePdf(bareFonts);
const pageCount = (buf) => (buf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length;
for (let i = 0; i < WARMUP + RUNS; i++) {
  const order = [['record', recordPdf], ['bare', () => barePdf()], ['bareFonts', bareFontsPdf]];
  for (const [name, fn] of i % 2 ? order.reverse() : order) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const buf = await fn();
    const ms = performance.now() - t0;
    const c = process.cpuUsage(c0);
    if (i >= WARMUP) {
      timings[name].push(ms);
      cpuTimes[name].push((c.user + c.system) / 1000);
    }
    pages[name] = pageCount(buf);
    bytes[name] = buf.length;
  }
}

const print = (line) => process.stdout.write(`${line}\n`);
const quantile = (xs, q) => {
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  return s[lo] + (s[Math.min(lo + 1, s.length - 1)] - s[lo]) * (pos - lo);
};
const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
const machine = `${cpu}, ${os.cpus().length} cores, Node ${process.version}, ${os.platform()} ${os.release()}`;
const result = {
  date: new Date().toISOString(),
  machine,
  entries: record.entries.length,
  durationMinutes: (Date.parse(record.code.endedAt) - ARREST_MS) / 60000,
  runs: RUNS,
  warmup: WARMUP,
  loadAverage: os.loadavg().map((l) => Math.round(l * 100) / 100),
  record: { medianMs: quantile(timings.record, 0.5), p90Ms: quantile(timings.record, 0.9), cpuMedianMs: quantile(cpuTimes.record, 0.5), pages: pages.record, bytes: bytes.record },
  bare: { medianMs: quantile(timings.bare, 0.5), p90Ms: quantile(timings.bare, 0.9), cpuMedianMs: quantile(cpuTimes.bare, 0.5), pages: pages.bare, bytes: bytes.bare },
  bareFonts: { medianMs: quantile(timings.bareFonts, 0.5), p90Ms: quantile(timings.bareFonts, 0.9), cpuMedianMs: quantile(cpuTimes.bareFonts, 0.5), pages: pages.bareFonts, bytes: bytes.bareFonts },
};

print(`PDF record of a ${result.durationMinutes}-minute code with ${result.entries} entries, ${RUNS} runs (+${WARMUP} warm-up)`);
print(`machine: ${machine}, load average ${result.loadAverage.join(' ')}`);
print('');
print('| document | median ms | p90 ms | CPU median ms | pages | bytes |');
print('| --- | ---: | ---: | ---: | ---: | ---: |');
const LABELS = {
  record: 'record PDF (digest, fold, summary, picture, stamp, layout, render)',
  bare: 'bare pdfmake, same picture and timeline table (font files as shipped)',
  bareFonts: 'the same bare document, fonts prepared as the record does',
};
for (const name of ['record', 'bare', 'bareFonts']) {
  const r = result[name];
  const label = LABELS[name];
  print(`| ${label} | ${r.medianMs.toFixed(0)} | ${r.p90Ms.toFixed(0)} | ${r.cpuMedianMs.toFixed(0)} | ${r.pages} | ${r.bytes} |`);
}
print(`record / bare (median wall, median CPU): ${(result.record.medianMs / result.bare.medianMs).toFixed(2)}x, ${(result.record.cpuMedianMs / result.bare.cpuMedianMs).toFixed(2)}x`);
print(`record / bare with prepared fonts:        ${(result.record.medianMs / result.bareFonts.medianMs).toFixed(2)}x, ${(result.record.cpuMedianMs / result.bareFonts.cpuMedianMs).toFixed(2)}x`);

// --- where the time goes (--parts): each step of the record alone, CPU ms, median ---------------
if (args.parts) {
  const med = (f) => {
    const xs = [];
    for (let i = 0; i < RUNS; i++) {
      const c0 = process.cpuUsage();
      f();
      const c = process.cpuUsage(c0);
      xs.push((c.user + c.system) / 1000);
    }
    return quantile(xs, 0.5);
  };
  const medAsync = async (f) => {
    const xs = [];
    for (let i = 0; i < RUNS; i++) {
      const c0 = process.cpuUsage();
      await f();
      const c = process.cpuUsage(c0);
      xs.push((c.user + c.system) / 1000);
    }
    return quantile(xs, 0.5);
  };
  const digest = recordDigest(record);
  const timeline = foldLog(record.code, record.entries, DEFAULT_PROTOCOL);
  const generatedAt = new Date().toISOString();
  const input = { record, digest, chain, integrity: { valid: true, problems: [] }, status: 'draft', timeline, signatures: [], people, timeZone: 'UTC', generatedAt, keyId, stamp: 'x' };
  const def = () => buildRecordPdf(input);
  const without = (change) => async () => renderPdf(change(def()));
  const rows = [
    ['digest (RFC 8785 + SHA-256)', med(() => recordDigest(record))],
    ['fold + summary', med(() => summarize(foldLog(record.code, record.entries, DEFAULT_PROTOCOL)))],
    ['build the definition (picture layout included)', med(def)],
    ['render, whole record', await medAsync(without((d) => d))],
    ['render, no header and footer', await medAsync(without((d) => ({ ...d, header: undefined, footer: undefined })))],
    ['render, no watermark', await medAsync(without((d) => ({ ...d, watermark: undefined })))],
    ['render, no picture', await medAsync(without((d) => ({ ...d, content: d.content.filter((c) => !(c && typeof c === 'object' && 'svg' in c)) })))],
    ['bare, picture only', await medAsync(() => bare.createPdf({ pageSize: 'A4', content: [{ svg: pictureSvg, width: 523 }], defaultStyle: { font: 'Atkinson' } }).getBuffer())],
  ];
  print('');
  print('| step (CPU ms, median) | ms |');
  print('| --- | ---: |');
  for (const [label, ms] of rows) print(`| ${label} | ${ms.toFixed(1)} |`);
}

mkdirSync(path.join(ROOT, 'bench/results'), { recursive: true });
writeFileSync(path.join(ROOT, `bench/results/pdf-record-${result.date.slice(0, 10)}.json`), JSON.stringify(result, null, 2) + '\n');

import { describe, expect, it } from 'vitest';
import {
  codePicture,
  codePictureSvg,
  PICTURE_LANES,
  type CodePicture,
  type PictureGroup,
  type PictureShape,
} from './code-picture.js';
import type { LogEntry } from './effective-log.js';
import {
  abs,
  adultCode,
  amendOf,
  cprStart,
  cprStop,
  drug,
  end,
  epi,
  etco2,
  rearrest,
  rhythm,
  rosc,
  shock,
  t,
  uuid,
} from './log-fixtures.test-support.js';
import { DEFAULT_PROTOCOL } from './protocol.js';
import { foldLog } from './timeline.js';

const fold = (entries: LogEntry[]) => foldLog(adultCode(), entries, DEFAULT_PROTOCOL);

/** A 12-minute code: VF, shocks, epinephrine, amiodarone, ROSC, re-arrest, ROSC again, end. */
function vfCode() {
  const first = rhythm(t(2, 0), 'vf');
  const log: LogEntry[] = [
    cprStart(t(0, 10)),
    etco2(t(1, 0), 14),
    cprStop(t(1, 58), 'rhythm-check'),
    first,
    shock(t(2, 5), 200),
    cprStart(t(2, 8)),
    // A 25 s pause: over the 10 s warning (DEFAULT_PROTOCOL.pauseWarningSeconds, our default).
    cprStop(t(4, 0), 'rhythm-check'),
    rhythm(t(4, 5), 'vf'),
    shock(t(4, 20), 300),
    cprStart(t(4, 25)),
    epi(t(4, 40)),
    etco2(t(5, 0), 22),
    drug(t(5, 10), 'amiodarone', 300),
    {
      id: uuid(),
      at: new Date(abs(t(5, 30))).toISOString(),
      kind: 'airway',
      device: 'endotracheal',
    },
    { id: uuid(), at: new Date(abs(t(5, 40))).toISOString(), kind: 'access', route: 'io' },
    cprStop(t(6, 0), 'rhythm-check'),
    rhythm(t(6, 4), 'organized', true),
    rosc(t(6, 10)),
    rearrest(t(8, 0)),
    cprStart(t(8, 5)),
    shock(t(9, 0), 120, true),
    etco2(t(9, 30), 35),
    cprStop(t(10, 0), 'rosc'),
    rosc(t(10, 2)),
    end(t(12, 0)),
  ];
  return { log, first };
}

const texts = (p: CodePicture, kind?: PictureGroup['kind']) =>
  p.groups
    .filter((g) => !kind || g.kind === kind)
    .flatMap((g) => g.shapes)
    .filter((s): s is Extract<PictureShape, { type: 'text' }> => s.type === 'text')
    .map((s) => s.text);
const marks = (p: CodePicture, kind: PictureGroup['kind']) =>
  p.groups.filter((g) => g.kind === kind);
/** The x where a mark stands: the first shape's left or centre. */
const markX = (g: PictureGroup): number => {
  const s = g.shapes[0] as PictureShape;
  if (s.type === 'rect') return s.x + s.w / 2;
  if (s.type === 'circle') return s.cx;
  if (s.type === 'line') return s.x1;
  if (s.type === 'path') return Number(/M([\d.]+)/.exec(s.d)?.[1]);
  return s.x;
};

describe('codePicture', () => {
  it('draws the lanes top to bottom in a fixed order with their names', () => {
    const p = codePicture(fold(vfCode().log), { width: 1000 });
    expect(p.lanes.map((l) => l.key)).toEqual([...PICTURE_LANES]);
    for (let i = 1; i < p.lanes.length; i++) {
      const [a, b] = [p.lanes[i - 1]!, p.lanes[i]!];
      expect(b.y).toBe(a.y + a.h);
    }
    expect(texts(p, 'lane')).toEqual([
      'Compressions',
      'Rhythm checks',
      'Shocks',
      'Drugs',
      'Airway, access',
      'ETCO2',
      'ROSC',
    ]);
    expect(p.height).toBeGreaterThan(p.lanes.at(-1)!.y + p.lanes.at(-1)!.h);
  });

  it('places marks by time: minutes from the arrest map linearly onto the plot', () => {
    const p = codePicture(fold(vfCode().log), { width: 1000 });
    expect(p.fromMs).toBe(abs(0));
    expect(p.toMs).toBe(abs(t(12, 0)));
    const at = (ms: number) => p.plotX + ((ms - p.fromMs) / (p.toMs - p.fromMs)) * p.plotW;
    const shocks = marks(p, 'shock');
    expect(shocks).toHaveLength(3);
    expect(markX(shocks[0]!)).toBeCloseTo(at(abs(t(2, 5))), 0);
    expect(markX(shocks[1]!)).toBeCloseTo(at(abs(t(4, 20))), 0);
    expect(markX(marks(p, 'arrest')[0]!)).toBeCloseTo(p.plotX, 5);
    expect(markX(marks(p, 'end')[0]!)).toBeCloseTo(p.plotX + p.plotW, 0);
    // Axis ticks at every minute here (12 minutes over ~900 px), labelled 0..12.
    expect(texts(p, 'axis')).toEqual(expect.arrayContaining(['0', '6', '12', 'min from arrest']));
  });

  it('marks a pause over the warning threshold with its seconds, and not a short one', () => {
    const p = codePicture(fold(vfCode().log), { width: 1000 });
    const pauses = marks(p, 'pause');
    // 1:58–2:08 is 10 s (not over), 4:00–4:25 is 25 s; 6:00 is a stop into ROSC (10 s); 10:00 ends in ROSC (2 s).
    expect(pauses.map((g) => g.label)).toEqual(['Pause of 25 s at 4:00, over the 10 s warning']);
    expect(texts(p, 'pause')).toEqual(['25 s']);
  });

  it('labels every kind of mark so it reads without colour', () => {
    const p = codePicture(fold(vfCode().log), { width: 1400 });
    expect(texts(p, 'rhythm')).toEqual(['VF', 'VF', 'Org', 'pulse']);
    expect(texts(p, 'shock')).toEqual(['200 J', '300 J', '120 J sync']);
    expect(texts(p, 'drug')).toEqual(['Epinephrine 1 mg', 'Amiodarone 300 mg']);
    expect(texts(p, 'airway')).toEqual(['ETT']);
    expect(texts(p, 'access')).toEqual(['IO']);
    expect(texts(p, 'etco2')).toEqual(['14', '22', '35']);
    expect(texts(p, 'rosc')).toEqual(['ROSC', 'ROSC']);
    expect(texts(p, 'rearrest')).toEqual(['Re-arrest']);
    expect(texts(p, 'arrest')).toEqual(['Arrest']);
    expect(texts(p, 'end')).toEqual(['End']);
    // A synchronised shock is a hollow triangle, a defibrillation a filled one.
    const fills = marks(p, 'shock').map(
      (g) => (g.shapes[0] as Extract<PictureShape, { type: 'path' }>).fill,
    );
    expect(fills).toEqual(['#000', '#000', '#fff']);
  });

  it('marks a corrected entry with a star and a dashed outline', () => {
    const { log, first } = vfCode();
    const p = codePicture(fold([...log, amendOf(t(20, 0), first, { rhythm: 'pvt' })]), {
      width: 1000,
    });
    const g = marks(p, 'rhythm')[0]!;
    expect(g.corrected).toBe(true);
    expect(texts({ ...p, groups: [g] })).toEqual(['pVT*']);
    expect(g.label).toContain('(corrected)');
    expect(g.shapes[0]).toMatchObject({ type: 'rect', dash: true });
    expect(marks(p, 'rhythm')[1]!.corrected).toBe(false);
  });

  it('puts entry ids on the marks only when asked', () => {
    const { log, first } = vfCode();
    const tl = fold(log);
    expect(codePicture(tl, { width: 800 }).groups.every((g) => g.entryId === null)).toBe(true);
    const withIds = codePicture(tl, { width: 800, entryIds: true });
    expect(marks(withIds, 'rhythm')[0]!.entryId).toBe(first.id);
    const ids = withIds.groups.map((g) => g.entryId).filter(Boolean);
    expect(new Set(ids).size).toBe(ids.length);
    expect(codePictureSvg(withIds)).toContain(`data-entry="${first.id}"`);
  });

  it('shows only the last minutes in a window, clipping bars at its left edge', () => {
    const tl = fold(vfCode().log);
    const p = codePicture(tl, { width: 1000, lastMs: t(5, 0), scale: 2 });
    expect(p.fromMs).toBe(abs(t(7, 0)));
    expect(p.toMs).toBe(abs(t(12, 0)));
    // Marks before 7:00 are left out; the 9:00 cardioversion stays.
    expect(texts(p, 'shock')).toEqual(['120 J sync']);
    expect(marks(p, 'drug')).toHaveLength(0);
    expect(marks(p, 'arrest')).toHaveLength(0);
    for (const g of p.groups.filter((g) => g.kind === 'compressions' || g.kind === 'rosc')) {
      const r = g.shapes[0] as Extract<PictureShape, { type: 'rect' }>;
      expect(r.x).toBeGreaterThanOrEqual(p.plotX);
      expect(r.x + r.w).toBeLessThanOrEqual(p.plotX + p.plotW + 0.2);
    }
    // Large type: the wall doubles the text size.
    expect(
      Math.min(
        ...p.groups.flatMap((g) => g.shapes).flatMap((s) => (s.type === 'text' ? [s.size] : [])),
      ),
    ).toBeGreaterThanOrEqual(16);
  });

  it('draws compact lanes a quarter lower for the wall, keeping every lane and its labels inside it', () => {
    const tl = fold(vfCode().log);
    const full = codePicture(tl, { width: 900, scale: 1.5 });
    const compact = codePicture(tl, { width: 900, scale: 1.5, compact: true });
    expect(compact.lanes.map((l) => l.key)).toEqual([...PICTURE_LANES]);
    const lanesH = (p: CodePicture) => p.lanes.reduce((sum, l) => sum + l.h, 0);
    expect(lanesH(compact)).toBeCloseTo(lanesH(full) * 0.75, 0);
    for (const g of compact.groups.filter((g) =>
      ['rhythm', 'shock', 'drug', 'airway', 'access'].includes(g.kind),
    )) {
      const lane = compact.lanes.find(
        (l) =>
          (g.kind === 'access'
            ? 'airway'
            : g.kind === 'shock'
              ? 'shocks'
              : g.kind === 'drug'
                ? 'drugs'
                : g.kind) === l.key,
      )!;
      for (const s of g.shapes)
        if (s.type === 'text') expect(s.y, g.label).toBeLessThanOrEqual(lane.y + lane.h);
    }
  });

  it('fills a window from the arrest before it slides, on a code still running', () => {
    const tl = fold([cprStart(t(0, 5)), rhythm(t(2, 0), 'asystole'), epi(t(3, 0))]);
    const p = codePicture(tl, { width: 600, lastMs: t(10, 0), nowMs: abs(t(4, 0)) });
    expect(p.fromMs).toBe(abs(0));
    expect(p.toMs).toBe(abs(t(10, 0)));
    // The running compressions bar reaches now (4:00), not the window's end.
    const bar = marks(p, 'compressions')[0]!.shapes[0] as Extract<PictureShape, { type: 'rect' }>;
    expect(bar.x + bar.w).toBeCloseTo(p.plotX + 0.4 * p.plotW, 0);
    expect(texts(p, 'rhythm')).toEqual(['Asys']);
    expect(marks(p, 'end')).toHaveLength(0);
  });

  it('is deterministic: the same timeline gives the same drawing and the same SVG', () => {
    const { log } = vfCode();
    const a = codePictureSvg(codePicture(fold(log), { width: 900, entryIds: true }));
    const b = codePictureSvg(codePicture(fold([...log].reverse()), { width: 900, entryIds: true }));
    expect(a).toBe(b);
    expect(a.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
  });

  it('escapes free text in the SVG', () => {
    const p = codePicture(fold([cprStart(t(0)), drug(t(1), 'Mag <b>&', 2, 'g')]), { width: 800 });
    const svg = codePictureSvg(p);
    expect(svg).toContain('Mag &lt;b&gt;&amp; 2 g');
    expect(svg).not.toContain('<b>');
  });
});

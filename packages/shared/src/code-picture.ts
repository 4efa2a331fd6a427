import type { EffectiveEntry } from './effective-log.js';
import type { Rhythm } from './entries.js';
import type { Timeline } from './timeline.js';

/**
 * The picture of a code: one pure layout of a folded Timeline into drawing primitives, lane by
 * lane, on a time axis in minutes from the arrest. The review screen, the quality page, the PDF
 * and the wall draw the same description. Every mark has a shape and a label, so it reads in
 * black and white: compressions are bars, a long pause a hatched box with its seconds, a rhythm
 * check a square with the rhythm, a shock a triangle with its energy, a drug a diamond with its
 * name and dose, airway a circle, access a plus, ETCO2 a line; "*" marks a corrected entry.
 */

export type PictureShape =
  | {
      type: 'rect';
      x: number;
      y: number;
      w: number;
      h: number;
      fill: string;
      stroke?: string;
      dash?: boolean;
    }
  | {
      type: 'line';
      x1: number;
      y1: number;
      x2: number;
      y2: number;
      stroke: string;
      width: number;
      dash?: boolean;
    }
  | { type: 'path'; d: string; fill: string; stroke: string; width: number }
  | { type: 'circle'; cx: number; cy: number; r: number; fill: string; stroke: string }
  | {
      type: 'text';
      x: number;
      y: number;
      text: string;
      size: number;
      anchor: 'start' | 'middle' | 'end';
      bold?: boolean;
    };

export type PictureMarkKind =
  | 'lane'
  | 'axis'
  | 'arrest'
  | 'end'
  | 'compressions'
  | 'pause'
  | 'rhythm'
  | 'shock'
  | 'drug'
  | 'airway'
  | 'access'
  | 'etco2'
  | 'rosc'
  | 'rearrest';

/** A group of shapes drawn together; marks of entries carry the entry's id when asked. */
export interface PictureGroup {
  kind: PictureMarkKind;
  /** The entry behind the mark (only with `entryIds`). */
  entryId: string | null;
  /** The mark in words (a tooltip, and what a screen reader says). */
  label: string;
  /** The entry was corrected after it was recorded. */
  corrected: boolean;
  shapes: PictureShape[];
}

export const PICTURE_LANES = [
  'compressions',
  'rhythm',
  'shocks',
  'drugs',
  'airway',
  'etco2',
  'rosc',
] as const;
export type PictureLaneKey = (typeof PICTURE_LANES)[number];

export interface PictureLane {
  key: PictureLaneKey;
  label: string;
  y: number;
  h: number;
}

export interface CodePicture {
  width: number;
  height: number;
  /** The time shown, in epoch ms. */
  fromMs: number;
  toMs: number;
  /** Left edge and width of the plotting area. */
  plotX: number;
  plotW: number;
  lanes: PictureLane[];
  groups: PictureGroup[];
}

export interface CodePictureOptions {
  /** Total width in px (or PDF points). */
  width: number;
  /** The end of a code still running (the wall's clock); ignored once the code has ended. */
  nowMs?: number;
  /** Show only the last this many ms before the end (or now): the wall's window. */
  lastMs?: number;
  /** 1 for a screen or a page; the wall uses about 2 (read across a room). */
  scale?: number;
  /** Put each entry's id on its mark (for hover and tap). */
  entryIds?: boolean;
  /** Lanes a quarter lower, labels in fewer rows: the wall, where height is short. */
  compact?: boolean;
}

const INK = '#000';
const MID = '#555';
const PALE = '#bbb';
const WHITE = '#fff';

export const RHYTHM_SHORT: Record<Rhythm, string> = {
  vf: 'VF',
  pvt: 'pVT',
  pea: 'PEA',
  asystole: 'Asys',
  organized: 'Org',
  other: 'Oth',
};
const AIRWAY_SHORT = { 'bag-mask': 'BMV', supraglottic: 'SGA', endotracheal: 'ETT' } as const;

const LANE_LABELS: Record<PictureLaneKey, string> = {
  compressions: 'Compressions',
  rhythm: 'Rhythm checks',
  shocks: 'Shocks',
  drugs: 'Drugs',
  airway: 'Airway, access',
  etco2: 'ETCO2',
  rosc: 'ROSC',
};
/** Lane heights at scale 1. */
const LANE_H: Record<PictureLaneKey, number> = {
  compressions: 26,
  rhythm: 38,
  shocks: 40,
  drugs: 46,
  airway: 38,
  etco2: 48,
  rosc: 26,
};

const round = (n: number) => Math.round(n * 10) / 10;
/** A rough width of text; enough to keep labels from overlapping. */
const textWidth = (text: string, size: number) => text.length * size * 0.56;

function minutesLabel(ms: number): string {
  return String(Math.round(ms / 60_000));
}

/** Axis step in minutes so labels stand at least `minPx` apart. */
function tickStep(spanMs: number, plotW: number, minPx: number): number {
  for (const m of [1, 2, 5, 10, 15, 20, 30, 60, 120]) {
    if ((m * 60_000 * plotW) / spanMs >= minPx) return m;
  }
  return 240;
}

/** Places labels left to right in up to `rows` rows; a label that fits nowhere is left out (the mark keeps it as its tooltip). */
/** How many label rows fit in a lane below a mark whose bottom is `markBottom` px under the lane's top. */
function rowsThatFit(laneH: number, markBottom: number, size: number): number {
  return Math.max(1, Math.min(3, Math.floor((laneH - markBottom - 2) / (size * 1.1))));
}

class LabelRows {
  private ends: number[];
  constructor(rows: number) {
    this.ends = Array.from({ length: rows }, () => -Infinity);
  }
  place(x: number, w: number): number | null {
    for (let i = 0; i < this.ends.length; i++) {
      if (x >= (this.ends[i] ?? Infinity) + 3) {
        this.ends[i] = x + w;
        return i;
      }
    }
    return null;
  }
}

export function codePicture(timeline: Timeline, options: CodePictureOptions): CodePicture {
  const scale = options.scale ?? 1;
  const density = options.compact ? 0.75 : 1;
  const size = 10 * scale;
  const small = 9 * scale;
  const width = options.width;
  const labelW = 96 * scale;
  const plotX = labelW;
  const plotW = Math.max(40, width - labelW - 8 * scale);
  const arrestMs = timeline.arrestAtMs;
  const endMs =
    timeline.end?.atMs ?? Math.max(timeline.lastEntryMs, options.nowMs ?? timeline.lastEntryMs);
  let fromMs = arrestMs;
  let toMs = Math.max(endMs, arrestMs + 60_000);
  if (options.lastMs !== undefined) {
    // The window keeps its length: it fills from the arrest, then slides.
    fromMs = Math.max(arrestMs, endMs - options.lastMs);
    toMs = fromMs + options.lastMs;
  }
  const span = toMs - fromMs;
  const x = (ms: number) => round(plotX + ((ms - fromMs) / span) * plotW);
  const inWindow = (ms: number) => ms >= fromMs && ms <= toMs;
  const byId = new Map<string, EffectiveEntry>(timeline.all.map((e) => [e.id, e]));
  const corrected = (id: string) => (byId.get(id)?.amendments.length ?? 0) > 0;
  const star = (id: string) => (corrected(id) ? '*' : '');
  const idOf = (id: string) => (options.entryIds ? id : null);
  const since = (ms: number) => {
    const s = Math.round((ms - arrestMs) / 1000);
    return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
  };

  const topBand = 16 * scale;
  const lanes: PictureLane[] = [];
  let y = topBand;
  for (const key of PICTURE_LANES) {
    const h = round(LANE_H[key] * scale * density);
    lanes.push({ key, label: LANE_LABELS[key], y, h });
    y += h;
  }
  const axisY = y;
  const height = round(axisY + 28 * scale);
  const lane = (key: PictureLaneKey) => lanes.find((l) => l.key === key) as PictureLane;
  const groups: PictureGroup[] = [];
  const add = (
    g: Omit<PictureGroup, 'corrected' | 'entryId'> & {
      entryId?: string | null;
      corrected?: boolean;
    },
  ) => groups.push({ entryId: null, corrected: false, ...g });

  // Lanes: a name on the left, a rule under each.
  for (const l of lanes) {
    add({
      kind: 'lane',
      label: l.label,
      shapes: [
        {
          type: 'text',
          x: 4 * scale,
          y: round(l.y + l.h / 2 + size * 0.35),
          text: l.label,
          size,
          anchor: 'start',
          bold: true,
        },
        {
          type: 'line',
          x1: 0,
          y1: round(l.y + l.h),
          x2: width,
          y2: round(l.y + l.h),
          stroke: PALE,
          width: 0.5,
        },
      ],
    });
  }

  // Time axis in minutes from the arrest.
  const step = tickStep(span, plotW, 40 * scale);
  const axis: PictureShape[] = [
    { type: 'line', x1: plotX, y1: axisY, x2: plotX + plotW, y2: axisY, stroke: INK, width: 1 },
  ];
  const firstTick = Math.ceil((fromMs - arrestMs) / (step * 60_000)) * step;
  for (let m = firstTick; arrestMs + m * 60_000 <= toMs; m += step) {
    const tx = x(arrestMs + m * 60_000);
    axis.push({
      type: 'line',
      x1: tx,
      y1: topBand,
      x2: tx,
      y2: axisY + 4 * scale,
      stroke: '#e2e2e2',
      width: 0.5,
    });
    axis.push({
      type: 'text',
      x: tx,
      y: round(axisY + 4 * scale + size),
      text: minutesLabel(m * 60_000),
      size: small,
      anchor: 'middle',
    });
  }
  axis.push({
    type: 'text',
    x: 4 * scale,
    y: round(axisY + 4 * scale + size),
    text: 'min from arrest',
    size: small,
    anchor: 'start',
  });
  add({ kind: 'axis', label: 'Minutes from the arrest', shapes: axis });

  // Compressions: a bar per run; a pause over the warning threshold is a hatched box with its seconds.
  const cl = lane('compressions');
  const barY = cl.y + cl.h * 0.3;
  const barH = cl.h * 0.45;
  for (const run of timeline.runs) {
    const a = Math.max(run.startMs, fromMs);
    const b = Math.min(run.endMs ?? endMs, toMs);
    if (b <= a) continue;
    add({
      kind: 'compressions',
      label: `Compressions ${since(run.startMs)} to ${since(run.endMs ?? endMs)}`,
      shapes: [
        { type: 'rect', x: x(a), y: round(barY), w: round(x(b) - x(a)), h: round(barH), fill: MID },
      ],
    });
  }
  const warnMs = timeline.protocol.pauseWarningSeconds * 1000;
  const pauseLabels = new LabelRows(1);
  for (const p of timeline.pauses) {
    if (p.endedBy === 'end') continue;
    const pEnd = p.endMs ?? endMs;
    if (pEnd - p.startMs <= warnMs) continue;
    const a = Math.max(p.startMs, fromMs);
    const b = Math.min(pEnd, toMs);
    if (b <= a) continue;
    const seconds = Math.round((pEnd - p.startMs) / 1000);
    const text = `${seconds} s`;
    const w = Math.max(round(x(b) - x(a)), 2);
    const shapes: PictureShape[] = [
      {
        type: 'rect',
        x: x(a),
        y: round(barY - 2 * scale),
        w,
        h: round(barH + 4 * scale),
        fill: WHITE,
        stroke: INK,
        dash: true,
      },
      {
        type: 'line',
        x1: x(a),
        y1: round(barY + barH + 2 * scale),
        x2: round(x(a) + w),
        y2: round(barY - 2 * scale),
        stroke: INK,
        width: 0.8,
      },
    ];
    const tw = textWidth(text, small);
    if (pauseLabels.place(x(a), tw) !== null) {
      shapes.push({
        type: 'text',
        x: x(a),
        y: round(cl.y + small),
        text,
        size: small,
        anchor: 'start',
        bold: true,
      });
    }
    add({
      kind: 'pause',
      label: `Pause of ${seconds} s at ${since(p.startMs)}, over the ${warnMs / 1000} s warning`,
      shapes,
    });
  }

  // Rhythm checks: a square with the rhythm; "P" under it when a pulse was felt.
  const rl = lane('rhythm');
  const sq = 20 * scale * density;
  for (const r of timeline.rhythmChecks) {
    if (!inWindow(r.atMs)) continue;
    const cx = x(r.atMs);
    const text = RHYTHM_SHORT[r.rhythm] + star(r.id);
    const w = Math.max(sq, textWidth(text, small) + 4 * scale);
    const shapes: PictureShape[] = [
      {
        type: 'rect',
        x: round(cx - w / 2),
        y: round(rl.y + 3 * scale),
        w: round(w),
        h: sq,
        fill: WHITE,
        stroke: INK,
        dash: corrected(r.id),
      },
      {
        type: 'text',
        x: cx,
        y: round(rl.y + 3 * scale + sq / 2 + small * 0.35),
        text,
        size: small,
        anchor: 'middle',
        bold: true,
      },
    ];
    if (r.pulse)
      shapes.push({
        type: 'text',
        x: cx,
        y: round(rl.y + rl.h - 3 * scale),
        text: 'pulse',
        size: small * 0.9,
        anchor: 'middle',
      });
    add({
      kind: 'rhythm',
      entryId: idOf(r.id),
      corrected: corrected(r.id),
      label: `Rhythm check at ${since(r.atMs)}: ${RHYTHM_SHORT[r.rhythm]}, ${r.pulse ? 'pulse' : 'no pulse'}${corrected(r.id) ? ' (corrected)' : ''}`,
      shapes,
    });
  }

  // Shocks: a triangle, its energy beside it ("sync" for a cardioversion; hollow then).
  const sl = lane('shocks');
  const shockRows = new LabelRows(Math.min(2, rowsThatFit(sl.h, 4 * scale + 12 * scale, small)));
  for (const s of timeline.shocks) {
    if (!inWindow(s.atMs)) continue;
    const cx = x(s.atMs);
    const top = sl.y + 4 * scale;
    const tri = 12 * scale;
    const text = `${s.joules} J${s.synchronized ? ' sync' : ''}${star(s.id)}`;
    const shapes: PictureShape[] = [
      {
        type: 'path',
        d: `M${round(cx)} ${round(top)}L${round(cx + tri / 2)} ${round(top + tri)}L${round(cx - tri / 2)} ${round(top + tri)}Z`,
        fill: s.synchronized ? WHITE : INK,
        stroke: INK,
        width: 1,
      },
    ];
    const tw = textWidth(text, small);
    const row = shockRows.place(cx - tri / 2, Math.max(tw, tri));
    if (row !== null)
      shapes.push({
        type: 'text',
        x: round(cx - tri / 2),
        y: round(top + tri + small + row * small * 1.1),
        text,
        size: small,
        anchor: 'start',
      });
    add({
      kind: 'shock',
      entryId: idOf(s.id),
      corrected: corrected(s.id),
      label: `Shock at ${since(s.atMs)}: ${s.joules} J${s.synchronized ? ' synchronised' : ''}${corrected(s.id) ? ' (corrected)' : ''}`,
      shapes,
    });
  }

  // Drugs: a diamond, name and dose beside it, in up to three rows.
  const dl = lane('drugs');
  const drugRows = new LabelRows(rowsThatFit(dl.h, 4 * scale + 10 * scale, small));
  for (const d of timeline.doses) {
    if (!inWindow(d.atMs)) continue;
    const cx = x(d.atMs);
    const r = 5 * scale;
    const cy = dl.y + 4 * scale + r;
    const text = `${d.label} ${d.dose} ${d.unit}${star(d.id)}`;
    const shapes: PictureShape[] = [
      {
        type: 'path',
        d: `M${round(cx)} ${round(cy - r)}L${round(cx + r)} ${round(cy)}L${round(cx)} ${round(cy + r)}L${round(cx - r)} ${round(cy)}Z`,
        fill: INK,
        stroke: INK,
        width: 1,
      },
    ];
    const tw = textWidth(text, small);
    const row = drugRows.place(cx - r, tw);
    if (row !== null)
      shapes.push({
        type: 'text',
        x: round(cx - r),
        y: round(cy + r + small + row * small * 1.1),
        text,
        size: small,
        anchor: 'start',
      });
    add({
      kind: 'drug',
      entryId: idOf(d.id),
      corrected: corrected(d.id),
      label: `${d.label} ${d.dose} ${d.unit} ${d.route.toUpperCase()} at ${since(d.atMs)}${corrected(d.id) ? ' (corrected)' : ''}`,
      shapes,
    });
  }

  // Airway (a circle) and access (a plus), with the device or route.
  const al = lane('airway');
  const airRows = new LabelRows(Math.min(2, rowsThatFit(al.h, 4 * scale + 10 * scale, small)));
  const things = [
    ...timeline.airway.map((e) => ({
      id: e.id,
      atMs: Date.parse(e.at),
      text: AIRWAY_SHORT[e.device],
      kind: 'airway' as const,
    })),
    ...timeline.access.map((e) => ({
      id: e.id,
      atMs: Date.parse(e.at),
      text: e.route.toUpperCase(),
      kind: 'access' as const,
    })),
  ].sort((a, b) => a.atMs - b.atMs);
  for (const a of things) {
    if (!inWindow(a.atMs)) continue;
    const cx = x(a.atMs);
    const r = 5 * scale;
    const cy = al.y + 4 * scale + r;
    const text = a.text + star(a.id);
    const shapes: PictureShape[] =
      a.kind === 'airway'
        ? [{ type: 'circle', cx, cy: round(cy), r, fill: WHITE, stroke: INK }]
        : [
            {
              type: 'path',
              d: `M${round(cx - r)} ${round(cy)}H${round(cx + r)}M${round(cx)} ${round(cy - r)}V${round(cy + r)}`,
              fill: 'none',
              stroke: INK,
              width: 2 * scale,
            },
          ];
    const row = airRows.place(cx - r, textWidth(text, small));
    if (row !== null)
      shapes.push({
        type: 'text',
        x: round(cx - r),
        y: round(cy + r + small + row * small * 1.1),
        text,
        size: small,
        anchor: 'start',
      });
    add({
      kind: a.kind,
      entryId: idOf(a.id),
      corrected: corrected(a.id),
      label: `${a.kind === 'airway' ? 'Airway' : 'Access'} ${a.text} at ${since(a.atMs)}${corrected(a.id) ? ' (corrected)' : ''}`,
      shapes,
    });
  }

  // ETCO2: a line from 0 to the larger of 60 mmHg and the highest reading, a dot per reading.
  const el = lane('etco2');
  const pts = timeline.etco2.filter((p) => inWindow(p.atMs));
  const top = Math.max(60, ...pts.map((p) => p.mmHg));
  const ey = (mmHg: number) => round(el.y + el.h - 4 * scale - (mmHg / top) * (el.h - 8 * scale));
  if (pts.length > 1) {
    add({
      kind: 'etco2',
      label: `ETCO2 line, 0 to ${top} mmHg`,
      shapes: [
        {
          type: 'path',
          d: pts.map((p, i) => `${i ? 'L' : 'M'}${x(p.atMs)} ${ey(p.mmHg)}`).join(''),
          fill: 'none',
          stroke: INK,
          width: 1.2 * scale,
        },
      ],
    });
  }
  const etRows = new LabelRows(1);
  for (const p of pts) {
    const text = `${p.mmHg}${star(p.id)}`;
    const shapes: PictureShape[] = [
      { type: 'circle', cx: x(p.atMs), cy: ey(p.mmHg), r: 2.5 * scale, fill: INK, stroke: INK },
    ];
    const tw = textWidth(text, small);
    if (etRows.place(x(p.atMs) - tw / 2, tw) !== null) {
      const above = ey(p.mmHg) - 4 * scale;
      const ty = above - small < el.y ? ey(p.mmHg) + small + 3 * scale : above;
      shapes.push({
        type: 'text',
        x: x(p.atMs),
        y: round(ty),
        text,
        size: small,
        anchor: 'middle',
      });
    }
    add({
      kind: 'etco2',
      entryId: idOf(p.id),
      corrected: corrected(p.id),
      label: `ETCO2 ${p.mmHg} mmHg at ${since(p.atMs)}`,
      shapes,
    });
  }

  // ROSC periods as open boxes; a re-arrest as a dashed line with its word.
  const ol = lane('rosc');
  for (const r of timeline.rosc) {
    const rEnd = r.endMs ?? endMs;
    const a = Math.max(r.startMs, fromMs);
    const b = Math.min(rEnd, toMs);
    if (b > a || inWindow(r.startMs)) {
      const w = Math.max(round(x(b) - x(a)), 2);
      const shapes: PictureShape[] = [
        {
          type: 'rect',
          x: x(a),
          y: round(ol.y + 4 * scale),
          w,
          h: round(ol.h - 8 * scale),
          fill: '#eee',
          stroke: INK,
        },
      ];
      if (w >= textWidth('ROSC', small) + 4 * scale)
        shapes.push({
          type: 'text',
          x: round(x(a) + 3 * scale),
          y: round(ol.y + ol.h / 2 + small * 0.35),
          text: 'ROSC',
          size: small,
          anchor: 'start',
          bold: true,
        });
      add({
        kind: 'rosc',
        label: `ROSC from ${since(r.startMs)}${r.endMs === null ? '' : ` to ${since(r.endMs)}`}`,
        shapes,
      });
    }
    if (r.endedBy === 'rearrest' && r.endMs !== null && inWindow(r.endMs)) {
      add({
        kind: 'rearrest',
        label: `Re-arrest at ${since(r.endMs)}`,
        shapes: [
          {
            type: 'line',
            x1: x(r.endMs),
            y1: topBand,
            x2: x(r.endMs),
            y2: axisY,
            stroke: INK,
            width: 1,
            dash: true,
          },
          {
            type: 'text',
            x: round(x(r.endMs) + 2 * scale),
            y: round(ol.y + ol.h - 2 * scale),
            text: 'Re-arrest',
            size: small,
            anchor: 'start',
          },
        ],
      });
    }
  }

  // The arrest and the end, across every lane.
  if (inWindow(arrestMs)) {
    add({
      kind: 'arrest',
      label: 'Arrest',
      shapes: [
        {
          type: 'line',
          x1: x(arrestMs),
          y1: topBand - 2 * scale,
          x2: x(arrestMs),
          y2: axisY,
          stroke: INK,
          width: 1.5 * scale,
        },
        {
          type: 'text',
          x: x(arrestMs),
          y: round(topBand - 4 * scale),
          text: 'Arrest',
          size: small,
          anchor: 'start',
          bold: true,
        },
      ],
    });
  }
  if (timeline.end && inWindow(timeline.end.atMs)) {
    const ex = x(timeline.end.atMs);
    add({
      kind: 'end',
      entryId: timeline.end.id ? idOf(timeline.end.id) : null,
      label: `End at ${since(timeline.end.atMs)}`,
      shapes: [
        {
          type: 'line',
          x1: ex,
          y1: topBand - 2 * scale,
          x2: ex,
          y2: axisY,
          stroke: INK,
          width: 1.5 * scale,
        },
        {
          type: 'text',
          x: ex,
          y: round(topBand - 4 * scale),
          text: 'End',
          size: small,
          anchor: 'end',
          bold: true,
        },
      ],
    });
  }

  return { width, height, fromMs, toMs, plotX, plotW, lanes, groups };
}

const escapeXml = (s: string) =>
  s.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string,
  );

function shapeSvg(s: PictureShape, font: string): string {
  switch (s.type) {
    case 'rect':
      return `<rect x="${s.x}" y="${s.y}" width="${s.w}" height="${s.h}" fill="${s.fill}"${s.stroke ? ` stroke="${s.stroke}"` : ''}${s.dash ? ' stroke-dasharray="3 2"' : ''}/>`;
    case 'line':
      return `<line x1="${s.x1}" y1="${s.y1}" x2="${s.x2}" y2="${s.y2}" stroke="${s.stroke}" stroke-width="${s.width}"${s.dash ? ' stroke-dasharray="4 3"' : ''}/>`;
    case 'path':
      return `<path d="${s.d}" fill="${s.fill}" stroke="${s.stroke}" stroke-width="${s.width}"/>`;
    case 'circle':
      return `<circle cx="${s.cx}" cy="${s.cy}" r="${s.r}" fill="${s.fill}" stroke="${s.stroke}"/>`;
    case 'text':
      return `<text x="${s.x}" y="${s.y}" font-family="${font}" font-size="${s.size}" text-anchor="${s.anchor}"${s.bold ? ' font-weight="bold"' : ''} fill="${INK}">${escapeXml(s.text)}</text>`;
  }
}

/** The picture as one SVG document (the PDF embeds it as vector). */
export function codePictureSvg(
  picture: CodePicture,
  options: { font?: string; title?: string } = {},
): string {
  const font = options.font ?? 'sans-serif';
  const body = picture.groups
    .map((g) => {
      const attrs = `${g.entryId ? ` data-entry="${escapeXml(g.entryId)}"` : ''} data-kind="${g.kind}"`;
      return `<g${attrs}>${g.shapes.map((s) => shapeSvg(s, font)).join('')}</g>`;
    })
    .join('');
  const title = options.title ? `<title>${escapeXml(options.title)}</title>` : '';
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${picture.width}" height="${picture.height}" viewBox="0 0 ${picture.width} ${picture.height}">${title}${body}</svg>`;
}

import { Box, Stack, Text } from '@chakra-ui/react';
import {
  codePicture,
  effectiveEntries,
  type CodePictureOptions,
  type LogEntry,
  type PictureGroup,
  type PictureShape,
  type ProtocolSettings,
  foldLog,
  type CanonicalRecord,
  type Timeline,
} from '@steadyhand/shared';
import { useEffect, useMemo, useRef, useState } from 'react';
import { formatClockTime, formatSeconds } from '../lib/format';
import { describeEntry } from '../lib/live/entry-words';

interface CodePictureViewProps {
  timeline: Timeline;
  /** The stored log, for the entry behind a mark (words, who, corrections). */
  entries: readonly LogEntry[];
  /** userId → name. */
  people?: Record<string, string>;
  protocol: ProtocolSettings | null;
  /** The wall's window and large type; the review and quality pages leave these out. */
  lastMs?: CodePictureOptions['lastMs'];
  nowMs?: number;
  scale?: number;
  compact?: boolean;
  /** Dark ink on a light card by default; the wall draws light on dark. */
  inverse?: boolean;
  /** Marks can be hovered, focused or tapped to show their entry. */
  interactive?: boolean;
  label: string;
}

/** Follows its box's width, so the picture is laid out for the space it has (never scaled text). */
function useWidth(fallback: number) {
  const ref = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(fallback);
  useEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === 'undefined') return;
    const ro = new ResizeObserver(([e]) => {
      if (e) setWidth(Math.max(320, Math.floor(e.contentRect.width)));
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, width] as const;
}

function Shape({ s }: { s: PictureShape }) {
  switch (s.type) {
    case 'rect':
      return (
        <rect
          x={s.x}
          y={s.y}
          width={s.w}
          height={s.h}
          fill={s.fill}
          stroke={s.stroke}
          strokeDasharray={s.dash ? '3 2' : undefined}
        />
      );
    case 'line':
      return (
        <line
          x1={s.x1}
          y1={s.y1}
          x2={s.x2}
          y2={s.y2}
          stroke={s.stroke}
          strokeWidth={s.width}
          strokeDasharray={s.dash ? '4 3' : undefined}
        />
      );
    case 'path':
      return <path d={s.d} fill={s.fill} stroke={s.stroke} strokeWidth={s.width} />;
    case 'circle':
      return <circle cx={s.cx} cy={s.cy} r={s.r} fill={s.fill} stroke={s.stroke} />;
    case 'text':
      return (
        <text
          x={s.x}
          y={s.y}
          fontSize={s.size}
          textAnchor={s.anchor}
          fontWeight={s.bold ? 'bold' : undefined}
          fill="currentColor"
        >
          {s.text}
        </text>
      );
  }
}

/**
 * The picture of a code drawn as inline SVG from the shared layout. Hovering, focusing or tapping
 * a mark shows its entry below: time, words, who, and any correction.
 */
export function CodePictureView({
  timeline,
  entries,
  people = {},
  protocol,
  lastMs,
  nowMs,
  scale,
  compact,
  inverse,
  interactive = true,
  label,
}: CodePictureViewProps) {
  const [ref, width] = useWidth(scale && scale > 1 ? 1600 : 1000);
  const picture = useMemo(
    () => codePicture(timeline, { width, lastMs, nowMs, scale, compact, entryIds: interactive }),
    [timeline, width, lastMs, nowMs, scale, compact, interactive],
  );
  const [selected, setSelected] = useState<string | null>(null);
  const byId = useMemo(() => new Map(entries.map((e) => [e.id, e])), [entries]);
  const effective = useMemo(
    () => new Map(effectiveEntries(entries).map((e) => [e.id, e])),
    [entries],
  );
  const who = (id: string | undefined, userId: string | undefined) =>
    (id ? byId.get(id)?.userName : undefined) ??
    (userId ? (people[userId] ?? 'Unknown person') : 'not recorded');
  const entry = selected ? effective.get(selected) : undefined;

  const group = (g: PictureGroup, i: number) => {
    const shapes = g.shapes.map((s, j) => <Shape key={j} s={s} />);
    if (!g.entryId)
      return (
        <g key={i} data-kind={g.kind}>
          {shapes}
        </g>
      );
    const id = g.entryId;
    return (
      <g
        key={i}
        data-kind={g.kind}
        data-entry={id}
        data-testid="picture-mark"
        role="button"
        tabIndex={0}
        aria-label={g.label}
        aria-pressed={selected === id}
        style={{ cursor: 'pointer', outline: 'none' }}
        onMouseEnter={() => setSelected(id)}
        onFocus={() => setSelected(id)}
        onClick={() => setSelected(id)}
      >
        <title>{g.label}</title>
        {shapes}
      </g>
    );
  };

  // The wall is light on dark: swap the two inks, keep the shapes.
  const fg = inverse ? 'white' : 'black';
  return (
    <Stack gap="2" ref={ref} w="full" minW="0">
      <Box
        as="figure"
        m="0"
        color={fg}
        bg={inverse ? 'transparent' : 'white'}
        borderWidth={inverse ? undefined : '1px'}
        borderRadius="l2"
        overflow="hidden"
        css={
          inverse
            ? {
                '& [fill="#000"]': { fill: 'white' },
                '& [stroke="#000"]': { stroke: 'white' },
                '& [fill="#fff"]': { fill: 'black' },
                '& [fill="#eee"]': { fill: '#333' },
                '& [fill="#555"]': { fill: '#bbb' },
              }
            : undefined
        }
      >
        <svg
          width={picture.width}
          height={picture.height}
          viewBox={`0 0 ${picture.width} ${picture.height}`}
          // With marks to focus, a group of buttons; without, one image (an image's parts are not reachable).
          role={interactive ? 'group' : 'img'}
          aria-label={label}
          data-testid="code-picture"
          style={{ display: 'block', maxWidth: '100%', height: 'auto' }}
        >
          {picture.groups.map(group)}
        </svg>
      </Box>
      {interactive ? (
        <Box minH="3.5rem" aria-live="polite" data-testid="picture-entry" px="1">
          {entry ? (
            <Stack gap="0.5">
              <Text fontWeight="bold">
                {formatClockTime(entry.at)} (+
                {formatSeconds((Date.parse(entry.at) - timeline.arrestAtMs) / 1000)}):{' '}
                {describeEntry(entry, protocol, byId)}
              </Text>
              <Text textStyle="sm">
                Recorded by {who(entry.id, byId.get(entry.id)?.userId)}
                {entry.deviceId ? ` on ${entry.deviceId}` : ''}.
              </Text>
              {entry.amendments.map((a) => (
                <Text key={a.id} textStyle="sm" data-testid="picture-entry-correction">
                  Corrected by {who(a.id, a.userId)} (first recorded:{' '}
                  {describeEntry(entry.original, protocol, byId)}): {a.reason}
                </Text>
              ))}
            </Stack>
          ) : (
            <Text color="fg.muted" textStyle="sm">
              Point at or tap a mark to see its entry. Squares are rhythm checks, triangles shocks
              (hollow: synchronised), diamonds drugs, circles airway, crosses access; a hatched box
              is a pause over the warning; * marks a corrected entry.
            </Text>
          )}
        </Box>
      ) : null}
    </Stack>
  );
}

/** The picture of a stored record: folds its log once with the code's own protocol. */
export function RecordPicture({
  record,
  people,
  protocol,
}: {
  record: CanonicalRecord;
  people?: Record<string, string>;
  protocol: ProtocolSettings;
}) {
  const timeline = useMemo(
    () => foldLog(record.code, record.entries, protocol),
    [record, protocol],
  );
  return (
    <CodePictureView
      timeline={timeline}
      entries={record.entries}
      people={people}
      protocol={protocol}
      label="The code at a glance: compressions, rhythm checks, shocks, drugs, airway and access, ETCO2 and ROSC against minutes from the arrest"
    />
  );
}

import { Box, Heading, SimpleGrid, Stack, Table, Text } from '@chakra-ui/react';
import { QUALITY_INTERVAL_LABELS, QUALITY_TARGET_IDS, TAPS_NOT_SENSOR, type QualityGroupStats, type QualityStats, type QuantileSummary } from '@steadyhand/shared';
import type { ReactNode } from 'react';
import { Bar, BarChart, CartesianGrid, Legend, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { OutcomeRates } from './outcome-rates';
import { formatPercent, formatSeconds, TARGET_WORDS } from './words';

// Our palette (theme/system.ts), dark enough on white; each series also has its own name in the legend and table.
const SERIES = ['#21766d', '#b07400', '#2d4060', '#a3233a'];

const iqr = (q: QuantileSummary, f: (v: number) => string) =>
  q.median === null || q.q1 === null || q.q3 === null ? '—' : `${f(q.median)} (${f(q.q1)}–${f(q.q3)})`;
const pctOrNull = (v: number | null) => (v === null ? null : Math.round(v * 1000) / 10);

/** A chart with its numbers beside it (the table is what a screen reader and the minutes use). */
function ChartWithTable({ title, id, chart, table, note }: { title: string; id: string; chart: ReactNode; table: ReactNode; note?: string }) {
  return (
    <Box as="section" aria-labelledby={`${id}-heading`} data-testid={`quality-chart-${id}`} borderWidth="1px" borderRadius="l3" p={{ base: '4', md: '6' }} bg="bg.panel">
      <Heading as="h2" id={`${id}-heading`} textStyle="xl" mb="1">
        {title}
      </Heading>
      {note ? (
        <Text color="fg.muted" textStyle="sm" mb="3">
          {note}
        </Text>
      ) : null}
      <SimpleGrid columns={{ base: 1, xl: 2 }} gap="6" alignItems="start">
        <Box aria-hidden="true" minH="300px">
          {chart}
        </Box>
        <Table.ScrollArea whiteSpace="normal">{table}</Table.ScrollArea>
      </SimpleGrid>
    </Box>
  );
}

function TargetShareChart({ groups, id, title }: { groups: QualityGroupStats[]; id: string; title: string }) {
  const data = groups.map((g) => ({ label: g.label, ...Object.fromEntries(QUALITY_TARGET_IDS.map((t) => [t, pctOrNull(g.targets[t].share)])) }));
  return (
    <ChartWithTable
      id={id}
      title={title}
      note="Share of the codes each target applies to that met it; the table gives met / applicable."
      chart={
        <ResponsiveContainer width="100%" height={300}>
          <BarChart accessibilityLayer={false} data={data}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis dataKey="label" />
            <YAxis domain={[0, 100]} unit="%" />
            <Tooltip />
            <Legend />
            {QUALITY_TARGET_IDS.map((t, i) => (
              <Bar key={t} dataKey={t} name={TARGET_WORDS[t]} fill={SERIES[i % SERIES.length]} isAnimationActive={false} />
            ))}
          </BarChart>
        </ResponsiveContainer>
      }
      table={
        <Table.Root size="sm" data-testid={`quality-table-${id}`}>
          <Table.Header>
            <Table.Row>
              <Table.ColumnHeader>{id.endsWith('unit') ? 'Unit' : 'Month'}</Table.ColumnHeader>
              <Table.ColumnHeader textAlign="end">Codes</Table.ColumnHeader>
              {QUALITY_TARGET_IDS.map((t) => (
                <Table.ColumnHeader key={t} textAlign="end">
                  {TARGET_WORDS[t]}
                </Table.ColumnHeader>
              ))}
            </Table.Row>
          </Table.Header>
          <Table.Body>
            {groups.map((g) => (
              <Table.Row key={g.key}>
                <Table.Cell>{g.label}</Table.Cell>
                <Table.Cell textAlign="end">{g.codes}</Table.Cell>
                {QUALITY_TARGET_IDS.map((t) => {
                  const s = g.targets[t];
                  return (
                    <Table.Cell key={t} textAlign="end">
                      {s.applicable === 0 ? '—' : `${formatPercent(s.share)} (${s.met}/${s.applicable})`}
                    </Table.Cell>
                  );
                })}
              </Table.Row>
            ))}
          </Table.Body>
        </Table.Root>
      }
    />
  );
}

function IntervalChart({ groups }: { groups: QualityGroupStats[] }) {
  const keys = ['toCompressionsSeconds', 'toFirstShockSeconds', 'toFirstEpinephrineSeconds'] as const;
  const data = groups.map((g) => ({ label: g.label, ...Object.fromEntries(keys.map((k) => [k, g.intervals[k].median])) }));
  return (
    <ChartWithTable
      id="intervals-month"
      title="Key intervals by month: median seconds from the arrest"
      note="The table gives median (interquartile range) in minutes:seconds, and how many codes had the time point."
      chart={
        <ResponsiveContainer width="100%" height={300}>
          <BarChart accessibilityLayer={false} data={data}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis dataKey="label" />
            <YAxis unit=" s" />
            <Tooltip />
            <Legend />
            {keys.map((k, i) => (
              <Bar key={k} dataKey={k} name={QUALITY_INTERVAL_LABELS[k]} fill={SERIES[i]} isAnimationActive={false} />
            ))}
          </BarChart>
        </ResponsiveContainer>
      }
      table={
        <Table.Root size="sm" data-testid="quality-table-intervals-month">
          <Table.Header>
            <Table.Row>
              <Table.ColumnHeader>Month</Table.ColumnHeader>
              {keys.map((k) => (
                <Table.ColumnHeader key={k} textAlign="end">
                  {QUALITY_INTERVAL_LABELS[k]}
                </Table.ColumnHeader>
              ))}
            </Table.Row>
          </Table.Header>
          <Table.Body>
            {groups.map((g) => (
              <Table.Row key={g.key}>
                <Table.Cell>{g.label}</Table.Cell>
                {keys.map((k) => (
                  <Table.Cell key={k} textAlign="end">
                    {iqr(g.intervals[k], formatSeconds)} <Text as="span" color="fg.muted">n={g.intervals[k].n}</Text>
                  </Table.Cell>
                ))}
              </Table.Row>
            ))}
          </Table.Body>
        </Table.Root>
      }
    />
  );
}

function CompressionFractionChart({ stats }: { stats: QualityStats }) {
  return (
    <ChartWithTable
      id="ccf"
      title="Compression fraction: how many codes in each band"
      note={`Median (interquartile range) over all codes: ${iqr(stats.overall.compressionFraction, (v) => formatPercent(v))}. Target: at least 80%. ${TAPS_NOT_SENSOR}`}
      chart={
        <ResponsiveContainer width="100%" height={300}>
          <BarChart accessibilityLayer={false} data={stats.compressionFractionBins}>
            <CartesianGrid strokeDasharray="3 3" />
            <XAxis dataKey="label" />
            <YAxis allowDecimals={false} />
            <Tooltip />
            <Bar dataKey="count" name="Codes" fill={SERIES[0]} isAnimationActive={false} />
          </BarChart>
        </ResponsiveContainer>
      }
      table={
        <Table.Root size="sm" data-testid="quality-table-ccf">
          <Table.Header>
            <Table.Row>
              <Table.ColumnHeader>Compression fraction (from taps)</Table.ColumnHeader>
              <Table.ColumnHeader textAlign="end">Codes</Table.ColumnHeader>
            </Table.Row>
          </Table.Header>
          <Table.Body>
            {stats.compressionFractionBins.map((b) => (
              <Table.Row key={b.label}>
                <Table.Cell>{b.label}</Table.Cell>
                <Table.Cell textAlign="end">{b.count}</Table.Cell>
              </Table.Row>
            ))}
          </Table.Body>
        </Table.Root>
      }
    />
  );
}

export function StatsCharts({ stats }: { stats: QualityStats }) {
  return (
    <Stack gap="6">
      <OutcomeRates stats={stats} />
      <TargetShareChart groups={stats.byMonth} id="targets-month" title="Targets met, by month" />
      <IntervalChart groups={stats.byMonth} />
      <CompressionFractionChart stats={stats} />
      <TargetShareChart groups={stats.byUnit} id="targets-unit" title="Targets met, by unit" />
      <Text textStyle="sm" color="fg.muted">
        {stats.quantileMethod} {stats.rateMethod} Months are calendar months in UTC.
      </Text>
    </Stack>
  );
}

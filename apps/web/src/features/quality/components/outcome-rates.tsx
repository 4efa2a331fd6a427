import { Box, Heading, SimpleGrid, Stack, Table, Text } from '@chakra-ui/react';
import type { QualityGroupStats, QualityStats, RateWithInterval } from '@steadyhand/shared';
import {
  Bar,
  BarChart,
  CartesianGrid,
  ErrorBar,
  Legend,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { formatPercent } from './words';

const SERIES = ['#21766d', '#2d4060'];
const pct = (v: number | null) => (v === null ? null : Math.round(v * 1000) / 10);

/** "50% (9–91%), 1 of 2": the rate, its 95% interval, and of how many codes whose answer is known. */
export function rateText(r: RateWithInterval): string {
  if (r.rate === null || r.low === null || r.high === null) return '—';
  return `${formatPercent(r.rate)} (${formatPercent(r.low)}–${formatPercent(r.high)}), ${r.count} of ${r.known}`;
}

function RatesTable({
  groups,
  id,
  first,
}: {
  groups: QualityGroupStats[];
  id: string;
  first: string;
}) {
  return (
    <Table.Root size="sm" data-testid={`quality-table-${id}`}>
      <Table.Header>
        <Table.Row>
          <Table.ColumnHeader>{first}</Table.ColumnHeader>
          <Table.ColumnHeader textAlign="end">Codes</Table.ColumnHeader>
          <Table.ColumnHeader textAlign="end">Any ROSC (95% CI)</Table.ColumnHeader>
          <Table.ColumnHeader textAlign="end">Survival to discharge (95% CI)</Table.ColumnHeader>
          <Table.ColumnHeader textAlign="end">Follow-up complete</Table.ColumnHeader>
        </Table.Row>
      </Table.Header>
      <Table.Body>
        {groups.map((g) => (
          <Table.Row key={g.key}>
            <Table.Cell>{g.label}</Table.Cell>
            <Table.Cell textAlign="end">{g.codes}</Table.Cell>
            <Table.Cell textAlign="end">{rateText(g.rosc)}</Table.Cell>
            <Table.Cell textAlign="end">
              {rateText(g.survivalToDischarge)}
              {g.survivalToDischarge.unknown > 0 ? (
                <Text as="span" color="fg.muted">
                  {' '}
                  ({g.survivalToDischarge.unknown} not known yet)
                </Text>
              ) : null}
            </Table.Cell>
            <Table.Cell textAlign="end">
              {formatPercent(g.followUpComplete.share)} ({g.followUpComplete.complete}/
              {g.followUpComplete.codes})
            </Table.Cell>
          </Table.Row>
        ))}
      </Table.Body>
    </Table.Root>
  );
}

function RatesChart({ groups }: { groups: QualityGroupStats[] }) {
  const point = (r: RateWithInterval) => ({
    rate: pct(r.rate),
    err:
      r.rate === null || r.low === null || r.high === null
        ? [0, 0]
        : [(pct(r.rate) ?? 0) - (pct(r.low) ?? 0), (pct(r.high) ?? 0) - (pct(r.rate) ?? 0)],
  });
  const data = groups.map((g) => {
    const rosc = point(g.rosc);
    const survival = point(g.survivalToDischarge);
    return {
      label: g.label,
      rosc: rosc.rate,
      roscErr: rosc.err,
      survival: survival.rate,
      survivalErr: survival.err,
    };
  });
  return (
    <ResponsiveContainer width="100%" height={300}>
      <BarChart accessibilityLayer={false} data={data}>
        <CartesianGrid strokeDasharray="3 3" />
        <XAxis dataKey="label" />
        <YAxis domain={[0, 100]} unit="%" />
        <Tooltip />
        <Legend />
        <Bar dataKey="rosc" name="Any ROSC" fill={SERIES[0]} isAnimationActive={false}>
          <ErrorBar dataKey="roscErr" width={6} stroke="#111" />
        </Bar>
        <Bar
          dataKey="survival"
          name="Survival to discharge"
          fill={SERIES[1]}
          isAnimationActive={false}
        >
          <ErrorBar dataKey="survivalErr" width={6} stroke="#111" />
        </Bar>
      </BarChart>
    </ResponsiveContainer>
  );
}

/** ROSC and survival-to-discharge rates with their 95% Wilson intervals, by month and by unit. */
export function OutcomeRates({ stats }: { stats: QualityStats }) {
  const parts = [
    { id: 'rates-month', title: 'Outcomes by month', groups: stats.byMonth, first: 'Month' },
    { id: 'rates-unit', title: 'Outcomes by unit', groups: stats.byUnit, first: 'Unit' },
  ];
  return (
    <Stack gap="6">
      {parts.map((p) => (
        <Box
          key={p.id}
          as="section"
          aria-labelledby={`${p.id}-heading`}
          data-testid={`quality-chart-${p.id}`}
          borderWidth="1px"
          borderRadius="l3"
          p={{ base: '4', md: '6' }}
          bg="bg.panel"
        >
          <Heading as="h2" id={`${p.id}-heading`} textStyle="xl" mb="1">
            {p.title}: any ROSC and survival to hospital discharge
          </Heading>
          <Text color="fg.muted" textStyle="sm" mb="3" data-testid={`quality-rate-method-${p.id}`}>
            Bars show the rate; the whiskers and the brackets in the table are its 95% confidence
            interval, a Wilson score interval. Survival counts only the codes whose follow-up says
            yes or no; the others are listed as not known yet.
          </Text>
          <SimpleGrid columns={{ base: 1, xl: 2 }} gap="6" alignItems="start">
            <Box aria-hidden="true" minH="300px">
              <RatesChart groups={p.groups} />
            </Box>
            <Table.ScrollArea whiteSpace="normal">
              <RatesTable groups={p.groups} id={p.id} first={p.first} />
            </Table.ScrollArea>
          </SimpleGrid>
        </Box>
      ))}
    </Stack>
  );
}

import { Badge, Button, Field, Heading, HStack, Input, List, NativeSelect, SimpleGrid, Stack, Table, Text } from '@chakra-ui/react';
import { CART_RESTOCK_DEFAULT_DAYS, type CartRestock, type PharmacyUnit } from '@steadyhand/shared';
import { useState } from 'react';
import { Link as RouterLink } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { cartRestockHref, useCartRestock } from '../api/pharmacy-api';
import { ExpiryBadge } from './expiry-badge';

const when = (iso: string) => new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' });

/** The server's default period, shown in the date field so the pharmacist sees what is asked. */
export function defaultSince(now = new Date()): string {
  const since = new Date(now);
  since.setUTCDate(since.getUTCDate() - CART_RESTOCK_DEFAULT_DAYS);
  return since.toISOString().slice(0, 10);
}

interface Props {
  units: PharmacyUnit[];
  hrefOf: (codeId: string) => string;
}

/** One restock list per cart: pick the unit and the date it was last restocked. */
export function CartRestockSection({ units, hrefOf }: Props) {
  const [unitId, setUnitId] = useState('');
  const [since, setSince] = useState(defaultSince);
  const restock = useCartRestock(unitId, since);
  const unit = units.find((u) => u.id === unitId);

  return (
    <Stack gap="4" as="section" aria-labelledby="cart-restock-heading" data-testid="cart-restock">
      <Stack gap="1">
        <Heading as="h2" id="cart-restock-heading" textStyle="2xl">
          Restock by cart
        </Heading>
        <Text color="fg.muted">Everything to put back on a unit&apos;s cart, summed over the signed-off codes since the date you choose (by arrest time, UTC).</Text>
      </Stack>
      <SimpleGrid as="form" role="search" aria-label="Choose a cart" columns={{ base: 1, sm: 2 }} gap="4" maxW="40rem" alignItems="end" onSubmit={(e) => e.preventDefault()}>
        <Field.Root>
          <Field.Label htmlFor="cart-restock-unit">Unit</Field.Label>
          <NativeSelect.Root size="lg">
            <NativeSelect.Field id="cart-restock-unit" value={unitId} onChange={(e) => setUnitId(e.currentTarget.value)} data-testid="cart-restock-unit">
              <option value="">Choose a unit</option>
              {units.map((u) => (
                <option key={u.id} value={u.id}>
                  {u.trayName ? `${u.name} (${u.trayName})` : `${u.name} (no tray)`}
                </option>
              ))}
            </NativeSelect.Field>
            <NativeSelect.Indicator />
          </NativeSelect.Root>
        </Field.Root>
        <Field.Root>
          <Field.Label htmlFor="cart-restock-since">Since (last restocked)</Field.Label>
          <Input id="cart-restock-since" type="date" size="lg" value={since} onChange={(e) => setSince(e.currentTarget.value)} data-testid="cart-restock-since" />
        </Field.Root>
      </SimpleGrid>
      {!unitId ? null : restock.isPending ? (
        <Text color="fg.muted">Loading the restock list…</Text>
      ) : restock.isError ? (
        <ErrorMessage title={`No restock list for ${unit?.name ?? 'this unit'}`} message={restock.error.message} />
      ) : (
        <CartRestockResult restock={restock.data} since={since} hrefOf={hrefOf} />
      )}
    </Stack>
  );
}

function CartRestockResult({ restock, since, hrefOf }: { restock: CartRestock; since: string; hrefOf: (codeId: string) => string }) {
  const number = new Map(restock.included.map((c, i) => [c.codeId, i + 1]));
  return (
    <Stack gap="4">
      <Text textStyle="lg">
        {restock.unit.name} · {restock.tray.name} · codes from {restock.since.slice(0, 10)}
      </Text>
      <HStack gap="4" wrap="wrap">
        <Button asChild variant="outline" size="lg">
          <a href={cartRestockHref(restock.unit.id, since, 'pdf')} target="_blank" rel="noreferrer" data-testid="cart-restock-pdf">
            Cart restock list (PDF, to print)
          </a>
        </Button>
        <Button asChild variant="outline" size="lg">
          <a href={cartRestockHref(restock.unit.id, since, 'csv')} download data-testid="cart-restock-csv">
            Cart restock list (CSV)
          </a>
        </Button>
      </HStack>
      <Stack gap="1" data-testid="cart-restock-included">
        <Text fontWeight="bold">Codes included: {restock.included.length}</Text>
        {restock.included.length === 0 ? (
          <Text color="fg.muted">No code on this cart in the period has a signed-off reconciliation.</Text>
        ) : (
          <List.Root ps="5">
            {restock.included.map((c, i) => (
              <List.Item key={c.codeId}>
                #{i + 1} <RouterLink to={hrefOf(c.codeId)}>arrest {when(c.arrestAt)}</RouterLink>
                {c.location ? `, ${c.location}` : ''}
              </List.Item>
            ))}
          </List.Root>
        )}
      </Stack>
      {restock.leftOut.length > 0 ? (
        <Stack gap="1" data-testid="cart-restock-left-out">
          <Text fontWeight="bold">Codes left out: {restock.leftOut.length}</Text>
          <List.Root ps="5">
            {restock.leftOut.map((c) => (
              <List.Item key={c.codeId} data-testid={`cart-restock-left-out-${c.codeId}`}>
                <Badge colorPalette="orange" variant="outline" me="2">
                  ● Left out
                </Badge>
                <RouterLink to={hrefOf(c.codeId)}>arrest {when(c.arrestAt)}</RouterLink>
                {c.location ? `, ${c.location}` : ''}: {c.message}
              </List.Item>
            ))}
          </List.Root>
        </Stack>
      ) : null}
      {restock.lines.length === 0 ? (
        <Text data-testid="cart-restock-empty">Nothing to restock: nothing opened in the codes included, and no lot on the tray expires within 30 days.</Text>
      ) : (
        <Table.ScrollArea borderWidth="1px" borderRadius="l2">
          <Table.Root size="sm" data-testid="cart-restock-lines">
            <Table.Header>
              <Table.Row>
                <Table.ColumnHeader>Drug</Table.ColumnHeader>
                <Table.ColumnHeader>Strength</Table.ColumnHeader>
                <Table.ColumnHeader textAlign="end">Par</Table.ColumnHeader>
                <Table.ColumnHeader textAlign="end">Opened</Table.ColumnHeader>
                <Table.ColumnHeader textAlign="end">Wasted</Table.ColumnHeader>
                <Table.ColumnHeader textAlign="end">Restock</Table.ColumnHeader>
                <Table.ColumnHeader>Lots used</Table.ColumnHeader>
                <Table.ColumnHeader>Lot on tray</Table.ColumnHeader>
                <Table.ColumnHeader>Expiry</Table.ColumnHeader>
                <Table.ColumnHeader>Codes</Table.ColumnHeader>
              </Table.Row>
            </Table.Header>
            <Table.Body>
              {restock.lines.map((l) => (
                <Table.Row key={l.drugKey} data-testid={`cart-restock-line-${l.drugKey}`}>
                  <Table.Cell fontWeight={l.controlled ? 'bold' : undefined}>
                    {l.label}
                    {l.controlled ? ' (controlled)' : ''}
                  </Table.Cell>
                  <Table.Cell>{l.strength ?? 'not on tray'}</Table.Cell>
                  <Table.Cell textAlign="end">{l.par ?? ''}</Table.Cell>
                  <Table.Cell textAlign="end">{l.unitsOpened}</Table.Cell>
                  <Table.Cell textAlign="end">{l.unitsWasted}</Table.Cell>
                  <Table.Cell textAlign="end" fontWeight="bold">
                    {l.restock}
                  </Table.Cell>
                  <Table.Cell>{l.lotsUsed.join(', ')}</Table.Cell>
                  <Table.Cell>{l.trayLot ?? ''}</Table.Cell>
                  <Table.Cell>
                    <Stack gap="1" align="flex-start">
                      <span>{l.trayExpiry ?? ''}</span>
                      <ExpiryBadge expiry={l.trayExpiry} />
                    </Stack>
                  </Table.Cell>
                  <Table.Cell>{l.codeIds.map((id) => `#${number.get(id) ?? '?'}`).join(' ')}</Table.Cell>
                </Table.Row>
              ))}
            </Table.Body>
          </Table.Root>
        </Table.ScrollArea>
      )}
    </Stack>
  );
}

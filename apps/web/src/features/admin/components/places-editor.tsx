import { Badge, Box, Button, Field, Heading, HStack, Input, Stack, Text } from '@chakra-ui/react';
import type { PlaceRoom, PlaceUnit } from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { isApiError } from '../../../lib/api-client';
import { useAdminPlaces, usePlacesChange } from '../api/admin';

type Change = ReturnType<typeof usePlacesChange>['mutate'];

/** One text box and a button: add or rename something. */
function NameForm({ label, initial = '', action, onSubmit }: { label: string; initial?: string; action: string; onSubmit: (name: string, clear: () => void) => void }) {
  const [name, setName] = useState(initial);
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        if (name.trim()) onSubmit(name.trim(), () => setName(''));
      }}
    >
      <HStack align="flex-end" gap="2" wrap="wrap">
        <Field.Root maxW="xs">
          <Field.Label>{label}</Field.Label>
          <Input size="sm" value={name} onChange={(e) => setName(e.target.value)} bg="bg.panel" />
        </Field.Root>
        <Button type="submit" size="sm" variant="outline" disabled={!name.trim() || name.trim() === initial}>
          {action}
        </Button>
      </HStack>
    </form>
  );
}

function RoomBlock({ room, change }: { room: PlaceRoom; change: Change }) {
  return (
    <Box borderLeftWidth="3px" borderColor="border" ps="4" py="2">
      <Stack gap="2">
        <HStack justify="space-between" wrap="wrap">
          <Text fontWeight="bold">{room.name}</Text>
          <Button size="xs" variant="ghost" colorPalette="red" aria-label={`Remove room ${room.name}`} onClick={() => change({ method: 'delete', path: `/api/admin/rooms/${room.id}` })}>
            Remove room
          </Button>
        </HStack>
        <HStack gap="2" wrap="wrap">
          {room.beds.map((bed) => (
            <Badge key={bed.id} size="lg" variant="outline">
              {bed.name}
              <Button size="2xs" variant="ghost" aria-label={`Remove ${bed.name} from ${room.name}`} onClick={() => change({ method: 'delete', path: `/api/admin/beds/${bed.id}` })}>
                ✕
              </Button>
            </Badge>
          ))}
          {room.beds.length === 0 ? <Text color="fg.muted">No beds yet.</Text> : null}
        </HStack>
        <NameForm label={`New bed in ${room.name}`} action="Add bed" onSubmit={(name, clear) => change({ method: 'post', path: `/api/admin/rooms/${room.id}/beds`, body: { name } }, { onSuccess: clear })} />
      </Stack>
    </Box>
  );
}

function UnitCard({ unit, change }: { unit: PlaceUnit; change: Change }) {
  return (
    <Box as="section" aria-label={unit.name} bg="bg.panel" borderWidth="1px" borderRadius="l3" p="5" opacity={unit.active ? 1 : 0.75} data-testid={`unit-${unit.name}`}>
      <Stack gap="4">
        <HStack justify="space-between" wrap="wrap">
          <Heading as="h3" textStyle="xl">
            {unit.name} {unit.active ? null : <Badge colorPalette="gray">Not in use</Badge>}
          </Heading>
          <Button size="sm" variant="outline" onClick={() => change({ method: 'patch', path: `/api/admin/units/${unit.id}`, body: { active: !unit.active } })}>
            {unit.active ? 'Stop using this unit' : 'Use this unit again'}
          </Button>
        </HStack>
        <NameForm label="Unit name" initial={unit.name} action="Rename" onSubmit={(name) => change({ method: 'patch', path: `/api/admin/units/${unit.id}`, body: { name } })} />
        {unit.rooms.map((room) => (
          <RoomBlock key={room.id} room={room} change={change} />
        ))}
        <NameForm label={`New room in ${unit.name}`} action="Add room" onSubmit={(name, clear) => change({ method: 'post', path: `/api/admin/units/${unit.id}/rooms`, body: { name } }, { onSuccess: clear })} />
      </Stack>
    </Box>
  );
}

/** The facility, its units, rooms and beds, as the start-code picker and the record show them. */
export function PlacesEditor() {
  const places = useAdminPlaces();
  const change = usePlacesChange();
  if (!places.data) return places.isError ? <ErrorMessage message="The places could not be loaded." /> : <PageSpinner label="Loading places…" />;
  return (
    <Stack gap="6">
      {change.isError ? <ErrorMessage message={isApiError(change.error) ? change.error.message : 'Cannot reach Steadyhand.'} /> : null}
      <NameForm
        key={places.data.facility.name}
        label="Facility name"
        initial={places.data.facility.name}
        action="Save facility name"
        onSubmit={(name) => change.mutate({ method: 'put', path: '/api/admin/places/facility', body: { name } })}
      />
      <NameForm label="New unit" action="Add unit" onSubmit={(name, clear) => change.mutate({ method: 'post', path: '/api/admin/units', body: { name } }, { onSuccess: clear })} />
      <Text color="fg.muted">Units are never deleted, because past codes point at them: stop using one instead.</Text>
      {places.data.units.map((unit) => (
        <UnitCard key={unit.id} unit={unit} change={change.mutate} />
      ))}
    </Stack>
  );
}

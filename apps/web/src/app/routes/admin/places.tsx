import { Stack, Text } from '@chakra-ui/react';
import { PageTitle } from '../../../components/ui/page-title';
import { PlacesEditor } from '../../../features/admin/components/places-editor';

export function Component() {
  return (
    <Stack gap="4">
      <PageTitle title="Places" />
      <Text color="fg.muted">What the start-code picker offers and what the record prints: the facility, its units, rooms and beds.</Text>
      <PlacesEditor />
    </Stack>
  );
}

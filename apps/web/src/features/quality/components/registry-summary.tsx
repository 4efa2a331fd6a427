import { Button, DataList, Heading, Stack, Text } from '@chakra-ui/react';
import {
  UTSTEIN_FIELD_LABELS,
  UTSTEIN_GROUPS,
  utsteinValueText,
  type UtsteinDetails,
  type UtsteinField,
} from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { formatDateTime } from './words';

const TIMES: readonly UtsteinField[] = ['teamArrivedAt', 'padsOnAt', 'deathPronouncedAt'];

/** The registry details as they read now, with the way to the record where they are completed. */
export function RegistrySummary({
  details,
  recordHref,
}: {
  details: UtsteinDetails;
  recordHref: string;
}) {
  const entered = UTSTEIN_GROUPS.flatMap((g) => g.fields).filter((f) => details[f] !== undefined);
  return (
    <Stack
      gap="4"
      as="section"
      aria-labelledby="registry-heading"
      data-testid="quality-registry-details"
    >
      <Heading as="h2" id="registry-heading" textStyle="2xl">
        Registry details
      </Heading>
      {entered.length === 0 ? (
        <Text>None entered yet.</Text>
      ) : (
        <DataList.Root orientation="horizontal" size="md">
          {entered.map((f) => (
            <DataList.Item key={f}>
              <DataList.ItemLabel minW="14rem">{UTSTEIN_FIELD_LABELS[f]}</DataList.ItemLabel>
              <DataList.ItemValue>
                {TIMES.includes(f)
                  ? formatDateTime(details[f] as string)
                  : utsteinValueText(f, details)}
              </DataList.ItemValue>
            </DataList.Item>
          ))}
        </DataList.Root>
      )}
      <div>
        <Button asChild variant="outline" size="lg">
          <RouterLink to={recordHref} data-testid="quality-registry-edit">
            Complete or change them on the record
          </RouterLink>
        </Button>
      </div>
    </Stack>
  );
}

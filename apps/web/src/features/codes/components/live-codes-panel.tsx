import { Badge, Box, Button, Flex, SimpleGrid, Spinner, Stack, Text } from '@chakra-ui/react';
import type { CodeCategory, Role } from '@steadyhand/shared';
import { useState } from 'react';
import dayjs from 'dayjs';
import { Link as RouterLink, useNavigate } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { HomePanel } from '../../../components/ui/home-panel';
import { paths } from '../../../config/paths';
import { useNow } from '../../../hooks/use-now';
import { useCreateCode } from '../api/create-code';
import { useActiveCodes, type CodeListItem } from '../api/get-active-codes';

const CATEGORY_LABELS: Record<CodeListItem['category'], string> = {
  adult: 'Adult',
  pediatric: 'Pediatric',
};

function minutesSince(iso: string, now: number): number | null {
  const at = dayjs(iso);
  if (!at.isValid()) return null;
  return Math.max(0, Math.floor((now - at.valueOf()) / 60_000));
}

/** Home panel for recorders and team leaders: codes running now, and the one-tap start. */
export function LiveCodesPanel({ roles }: { roles: readonly Role[] }) {
  const navigate = useNavigate();
  const codes = useActiveCodes();
  const startCode = useCreateCode({
    onSuccess: (code) => {
      void navigate(paths.codes.record.getHref(code.id));
    },
  });

  return (
    <HomePanel
      testIds={roles.map((role) => `home-panel-${role}`)}
      title="Live codes"
      description="Start a code the moment an arrest is called; the location and details can follow."
    >
      <StartCode starting={startCode.isPending} onStart={(category) => startCode.mutate({ category })} />
      {startCode.isError ? (
        <ErrorMessage title="The code was not started" message={startCode.error.message} />
      ) : null}
      <ActiveCodeList codes={codes.data} isPending={codes.isPending} error={codes.error} />
      <Button asChild variant="ghost" colorPalette="brand" alignSelf="start" data-testid="live-codes-board">
        <RouterLink to={paths.wallBoard.getHref()}>Board of all live codes</RouterLink>
      </Button>
    </HomePanel>
  );
}

/**
 * Starting a code asks one question first, adult or child, because every dose and energy
 * follows from it; a child's weight can be given on the pad right after.
 */
function StartCode({ starting, onStart }: { starting: boolean; onStart: (category: CodeCategory) => void }) {
  const [asking, setAsking] = useState(false);
  if (!asking)
    return (
      <Button colorPalette="brand" size="2xl" w={{ base: 'full', md: 'auto' }} minW={{ md: '20rem' }} data-testid="start-code" onClick={() => setAsking(true)}>
        Start a code
      </Button>
    );
  return (
    <Stack gap="2" role="group" aria-labelledby="start-question" data-testid="start-choice">
      <Text id="start-question" textStyle="xl" fontWeight="bold">
        Who is the patient?
      </Text>
      <SimpleGrid columns={2} gap="3" maxW="40rem">
        <Button colorPalette="brand" size="2xl" minH="24" loading={starting} data-testid="start-adult" onClick={() => onStart('adult')}>
          Adult
        </Button>
        <Button colorPalette="ink" size="2xl" minH="24" loading={starting} data-testid="start-child" onClick={() => onStart('pediatric')}>
          Child
          <Text as="span" textStyle="sm" display="block" fontWeight="normal">
            weight next
          </Text>
        </Button>
      </SimpleGrid>
      <Button variant="ghost" alignSelf="start" onClick={() => setAsking(false)} disabled={starting}>
        Cancel
      </Button>
    </Stack>
  );
}

interface ActiveCodeListProps {
  codes: CodeListItem[] | undefined;
  isPending: boolean;
  error: Error | null;
}

function ActiveCodeList({ codes, isPending, error }: ActiveCodeListProps) {
  const now = useNow(30_000);

  if (isPending) {
    return (
      <Flex role="status" align="center" gap="3">
        <Spinner size="md" color="brand.solid" />
        <Text>Looking for codes in progress…</Text>
      </Flex>
    );
  }
  if (error) return <ErrorMessage title="Live codes could not be loaded" message={error.message} />;
  if (!codes || codes.length === 0) {
    return <Text data-testid="live-codes-empty">No codes are running right now.</Text>;
  }

  return (
    <Stack as="ul" gap="3" listStyleType="none" m="0" p="0" aria-label="Codes in progress">
      {codes.map((code) => {
        const minutes = minutesSince(code.arrestAt, now);
        const arrestClock = dayjs(code.arrestAt).isValid() ? dayjs(code.arrestAt).format('HH:mm') : null;
        return (
          <Box as="li" key={code.id} borderWidth="1px" borderColor="border.emphasized" borderRadius="l2" p="4">
            <Flex align="center" justify="space-between" gap="4" wrap="wrap">
              <Stack gap="1">
                <Text fontWeight="bold" textStyle="xl">
                  {code.location ?? 'Location not yet recorded'}
                </Text>
                <Flex gap="3" align="center" wrap="wrap">
                  <Badge colorPalette="ink" variant="subtle" size="lg">
                    {CATEGORY_LABELS[code.category]}
                  </Badge>
                  {arrestClock ? (
                    <Text color="fg.muted">
                      Arrest at {arrestClock}
                      {minutes !== null ? ` · ${String(minutes)} min ago` : ''}
                    </Text>
                  ) : null}
                </Flex>
              </Stack>
              <Flex gap="2" wrap="wrap">
                <Button asChild variant="outline" colorPalette="brand">
                  <RouterLink
                    to={paths.codes.record.getHref(code.id)}
                    aria-label={`Open the code at ${code.location ?? 'an unrecorded location'}`}
                  >
                    Open
                  </RouterLink>
                </Button>
                <Button asChild variant="outline" colorPalette="ink" data-testid="live-code-wall">
                  <RouterLink
                    to={paths.codes.wall.getHref(code.id)}
                    aria-label={`Timer wall for the code at ${code.location ?? 'an unrecorded location'}`}
                  >
                    Timer wall
                  </RouterLink>
                </Button>
              </Flex>
            </Flex>
          </Box>
        );
      })}
    </Stack>
  );
}

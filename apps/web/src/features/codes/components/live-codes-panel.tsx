import { Badge, Box, Button, Flex, Spinner, Stack, Text } from '@chakra-ui/react';
import type { Role } from '@steadyhand/shared';
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
      <Button
        colorPalette="brand"
        size="2xl"
        w={{ base: 'full', md: 'auto' }}
        minW={{ md: '20rem' }}
        loading={startCode.isPending}
        loadingText="Starting…"
        onClick={() => {
          startCode.mutate({ category: 'adult' });
        }}
      >
        Start a code
      </Button>
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

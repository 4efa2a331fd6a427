import { Box, Button, Heading, HStack, List, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { SIGNATURE_MEANING_TEXT, type SignatureMeaning } from '@steadyhand/shared';
import { Link as RouterLink, useParams } from 'react-router';
import { RecordPicture } from '../../../components/code-picture';
import { SummaryFacts } from '../../../components/summary-facts';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useQualityCode } from '../../../features/quality/api/get-quality-code';
import { useRecordView } from '../../../features/records/api/records-api';
import { useCodeProtocol } from '../../../lib/protocol';
import { FollowUpPanel } from '../../../features/quality/components/follow-up-panel';
import { QualityGate } from '../../../features/quality/components/quality-gate';
import { RegistrySummary } from '../../../features/quality/components/registry-summary';
import { ReviewPanel } from '../../../features/quality/components/review-panel';
import { TargetList } from '../../../features/quality/components/target-list';
import { formatDateTime } from '../../../features/quality/components/words';

/** The picture from the record's own log, folded with the code's protocol version. */
function QualityPicture({ codeId }: { codeId: string }) {
  const view = useRecordView(codeId);
  const protocol = useCodeProtocol(view.data ? (view.data.record.code.protocolVersion ?? null) : undefined);
  if (view.isError) return <ErrorMessage message={view.error.message} />;
  if (!view.data || !protocol.data) return <Text role="status">Loading the picture…</Text>;
  return <RecordPicture record={view.data.record} people={view.data.people} protocol={protocol.data} />;
}

function QualityCode({ codeId }: { codeId: string }) {
  const query = useQualityCode(codeId);
  if (query.isPending) return <PageSpinner label="Loading the code…" />;
  if (query.isError) return <ErrorMessage title="This code cannot be shown" message={query.error.message} />;
  const { code, summary, targets, review, signatures, utstein, followUp } = query.data;
  const where = [code.unitName, code.location].filter(Boolean).join(', ') || 'Location not recorded';

  return (
    <Stack gap="8">
      <Stack gap="2">
        <Button asChild variant="plain" alignSelf="start" px="0">
          <RouterLink to={paths.quality.list.getHref()}>← All codes</RouterLink>
        </Button>
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="quality-code-heading">
          {where}, {formatDateTime(code.arrestAt)}
        </Heading>
        <Text color="fg.muted">
          {code.category === 'pediatric' ? 'Pediatric' : 'Adult'} code; {code.status === 'ended' ? `ended ${formatDateTime(code.endedAt)}` : 'still running'}.
        </Text>
      </Stack>

      <Box as="section" aria-labelledby="summary-heading">
        <Heading as="h2" id="summary-heading" textStyle="2xl" mb="4">
          Summary from the record
        </Heading>
        <SummaryFacts summary={summary} />
      </Box>

      <Box as="section" aria-labelledby="picture-heading" data-testid="quality-picture">
        <Heading as="h2" id="picture-heading" textStyle="2xl" mb="4">
          The code at a glance
        </Heading>
        <QualityPicture codeId={code.id} />
      </Box>

      <Box as="section" aria-labelledby="targets-heading">
        <Heading as="h2" id="targets-heading" textStyle="2xl" mb="4">
          Targets
        </Heading>
        <TargetList targets={targets} />
      </Box>

      <SimpleGrid columns={{ base: 1, lg: 2 }} gap="8">
        <RegistrySummary details={utstein} recordHref={paths.codes.review.getHref(code.id)} />
        <FollowUpPanel key={code.id} codeId={code.id} arrestAt={code.arrestAt} followUp={followUp} open={code.status === 'ended'} />
      </SimpleGrid>

      <SimpleGrid columns={{ base: 1, lg: 2 }} gap="8">
        <ReviewPanel key={code.id} codeId={code.id} review={review} reviewable={code.status === 'ended'} />
        <Stack gap="4" as="section" aria-labelledby="record-heading">
          <Heading as="h2" id="record-heading" textStyle="2xl">
            Signed record and export
          </Heading>
          {signatures.length > 0 ? (
            <List.Root gap="1" ps="5">
              {signatures.map((s) => (
                <List.Item key={`${s.meaning}-${s.signedAt}`}>
                  {SIGNATURE_MEANING_TEXT[s.meaning as SignatureMeaning] ?? s.meaning} {s.printedName}, {formatDateTime(s.signedAt)}
                </List.Item>
              ))}
            </List.Root>
          ) : (
            <Text>The record is not signed yet. The FHIR document is made from a signed record.</Text>
          )}
          <HStack>
            {signatures.length > 0 ? (
              <Button asChild colorPalette="brand" size="lg">
                <a href={`/api/quality/codes/${encodeURIComponent(code.id)}/fhir`} download data-testid="quality-export-fhir">
                  FHIR document (JSON)
                </a>
              </Button>
            ) : (
              <Button colorPalette="brand" size="lg" disabled>
                FHIR document (JSON)
              </Button>
            )}
          </HStack>
        </Stack>
      </SimpleGrid>
    </Stack>
  );
}

export function Component() {
  const { codeId = '' } = useParams();
  return (
    <>
      <PageTitle title="Code review" />
      <QualityGate>
        <QualityCode codeId={codeId} />
      </QualityGate>
    </>
  );
}

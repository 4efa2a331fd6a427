import { Alert, Box, Button, Heading, HStack, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { effectiveUtstein, hasAnyRole, WRITER_ROLES } from '@steadyhand/shared';
import { useState } from 'react';
import { Link as RouterLink, useParams } from 'react-router';
import { RecordPicture } from '../../../components/code-picture';
import { SummaryFacts } from '../../../components/summary-facts';
import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { useCodeSummary, useRecordView } from '../../../features/records/api/records-api';
import { AttachmentsPanel } from '../../../features/records/components/attachments-panel';
import { CorrectionDialog } from '../../../features/records/components/correction-dialog';
import { NoteForm } from '../../../features/records/components/note-form';
import { RecordIntegrity } from '../../../features/records/components/record-integrity';
import { RecordStatusBadge } from '../../../features/records/components/record-status-badge';
import {
  RecordTimeline,
  type CorrectionTarget,
} from '../../../features/records/components/record-timeline';
import { ReviewDetailsForm } from '../../../features/records/components/review-details-form';
import { SignaturesPanel } from '../../../features/records/components/signatures-panel';
import { UtsteinDetailsForm } from '../../../features/records/components/utstein-details-form';
import { formatDateTime } from '../../../lib/format';
import { useCodeProtocol } from '../../../lib/protocol';
import { ReviewReplay } from './review-replay';

function CodeReview({ codeId }: { codeId: string }) {
  const user = useCurrentUser();
  const view = useRecordView(codeId);
  const summary = useCodeSummary(codeId);
  // The version the code started with: an admin's later change never alters its record.
  const protocol = useCodeProtocol(view.data ? (view.data.record.code.protocolVersion ?? null) : undefined);
  const [correcting, setCorrecting] = useState<CorrectionTarget | null>(null);

  if (view.isPending) return <PageSpinner label="Loading the record…" />;
  if (view.isError)
    return <ErrorMessage title="This record cannot be shown" message={view.error.message} />;
  const { record, status } = view.data;
  const { code } = record;
  const writer = user.roles.some((r) => WRITER_ROLES.includes(r));
  const ended = code.status === 'ended';
  const patient = code.patient?.name
    ? `${code.patient.name}${code.patient.mrn ? ` (${code.patient.mrn})` : ''}`
    : 'Unknown patient';

  return (
    <Stack gap="10">
      <Stack gap="3">
        <Button asChild variant="plain" alignSelf="start" px="0">
          <RouterLink to={paths.records.list.getHref()}>← All records</RouterLink>
        </Button>
        <HStack gap="4" wrap="wrap" align="center">
          <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="review-heading">
            {code.location ?? 'Location not recorded'}
          </Heading>
          <RecordStatusBadge status={status} />
        </HStack>
        <Text textStyle="lg">
          {record.facility}. {patient}.{' '}
          {code.category === 'pediatric'
            ? `Pediatric${code.weightKg ? `, ${code.weightKg} kg` : ''}`
            : 'Adult'}
          . Arrest recognised {formatDateTime(code.arrestAt)};{' '}
          {ended ? `ended ${formatDateTime(code.endedAt)}` : 'still running'}.
        </Text>
        {!ended ? (
          <Alert.Root status="warning" variant="outline">
            <Alert.Indicator />
            <Alert.Title>
              This code is still running. Record on the pad; the record is completed and signed
              after the code ends.{' '}
              <RouterLink to={paths.codes.record.getHref(code.id)}>Open the pad</RouterLink>
            </Alert.Title>
          </Alert.Root>
        ) : null}
      </Stack>

      <Box as="section" aria-labelledby="summary-heading">
        <Heading as="h2" id="summary-heading" textStyle="2xl" mb="4">
          Summary
        </Heading>
        {summary.data ? (
          <SummaryFacts summary={summary.data} />
        ) : summary.isError ? (
          <ErrorMessage message={summary.error.message} />
        ) : (
          <Text role="status">Loading the summary…</Text>
        )}
      </Box>

      {protocol.data ? (
        <Stack as="section" gap="3" aria-labelledby="picture-heading" data-testid="review-picture">
          <Heading as="h2" id="picture-heading" textStyle="2xl">
            The code at a glance
          </Heading>
          <RecordPicture record={record} people={view.data.people} protocol={protocol.data} />
        </Stack>
      ) : null}

      <Stack as="section" gap="4" aria-labelledby="timeline-heading">
        <Heading as="h2" id="timeline-heading" textStyle="2xl">
          Timeline
        </Heading>
        <Text color="fg.muted">
          Every entry as it now reads. Corrections keep what was first recorded beside them; voided
          entries stay, struck through.
          {status !== 'draft'
            ? ' The record is signed: corrections and notes go in as addenda.'
            : ''}
        </Text>
        <RecordTimeline
          view={view.data}
          protocol={protocol.data ?? null}
          onCorrect={writer && ended ? setCorrecting : undefined}
        />
        {writer && ended ? <NoteForm codeId={code.id} status={status} /> : null}
      </Stack>

      {protocol.data ? <ReviewReplay record={record} protocol={protocol.data} /> : null}

      <SimpleGrid columns={{ base: 1, xl: 2 }} gap="10">
        <ReviewDetailsForm code={code} editable={writer && ended && status === 'draft'} />
        <AttachmentsPanel codeId={code.id} canUpload={writer} />
      </SimpleGrid>

      <UtsteinDetailsForm
        codeId={code.id}
        arrestAt={code.arrestAt}
        details={effectiveUtstein(code.utstein, record.detailAddenda)}
        addenda={record.detailAddenda ?? []}
        signed={status !== 'draft'}
        closedAt={view.data.qualityReviewedAt}
        editable={ended && view.data.qualityReviewedAt === null && (writer || hasAnyRole(user.roles, ['reviewer', 'admin']))}
        readOnlyReason={
          !ended
            ? 'Completed after the code ends.'
            : 'Completed by the recorder, the team leader or a quality reviewer.'
        }
      />

      <SignaturesPanel view={view.data} user={user} />
      <RecordIntegrity view={view.data} />

      <CorrectionDialog
        codeId={code.id}
        status={status}
        target={correcting}
        protocol={protocol.data ?? null}
        onClose={() => setCorrecting(null)}
      />
    </Stack>
  );
}

export function Component() {
  const { codeId = '' } = useParams();
  return (
    <>
      <PageTitle title="Code record" />
      <CodeReview codeId={codeId} />
    </>
  );
}

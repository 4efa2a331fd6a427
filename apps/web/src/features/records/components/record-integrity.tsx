import { Button, Code, Heading, HStack, List, Stack, Text } from '@chakra-ui/react';
import type { RecordView } from '@steadyhand/shared';
import { Link as RouterLink } from 'react-router';
import { paths } from '../../../config/paths';
import { recordPdfHref } from '../api/records-api';

/** The printed copy and how anyone can check it: the digest of the record as it stands now. */
export function RecordIntegrity({ view }: { view: RecordView }) {
  const draft = view.status !== 'signed';
  return (
    <Stack as="section" gap="4" aria-labelledby="integrity-heading" data-testid="record-integrity">
      <Heading as="h2" id="integrity-heading" textStyle="2xl">
        The code record (PDF)
      </Heading>
      <Text>
        {draft
          ? 'Until both signatures are in, every page of the PDF is marked as a draft.'
          : 'The PDF carries the signatures, the digest below and the server’s signature on every page.'}
      </Text>
      <Text textStyle="sm">
        SHA-256 of the record now:{' '}
        <Code wordBreak="break-all" data-testid="record-digest">
          {view.digest}
        </Code>
      </Text>
      <Text
        textStyle="sm"
        fontWeight="bold"
        color={view.chain.valid ? 'seaglass.700' : 'alarm.700'}
        data-testid="record-chain"
        data-valid={view.chain.valid ? 'true' : 'false'}
      >
        {view.chain.valid
          ? `✓ Entry chain intact: ${view.chain.length} entries, each hash covering the one before.`
          : `✕ Entry chain broken${view.chain.brokenAt ? ` at entry ${view.chain.brokenAt.position}: ${view.chain.brokenAt.reason}` : ''}. Tell the administrator: the log may have been altered outside Steadyhand.`}
      </Text>
      {view.integrity.valid ? (
        <Text textStyle="sm" fontWeight="bold" color="seaglass.700" data-testid="record-check" data-valid="true">
          ✓ Record check: the server’s seal, every signature and every attachment file verify.
        </Text>
      ) : (
        <Stack gap="1" data-testid="record-check" data-valid="false" role="alert">
          <Text textStyle="sm" fontWeight="bold" color="alarm.700">
            ✕ Record check failed: this record was changed outside Steadyhand. Tell the administrator.
          </Text>
          <List.Root textStyle="sm" color="alarm.700" ps="5">
            {view.integrity.problems.map((p) => (
              <List.Item key={p}>{p}</List.Item>
            ))}
          </List.Root>
        </Stack>
      )}
      <HStack gap="3" wrap="wrap">
        <Button asChild colorPalette="brand" size="lg">
          <a href={recordPdfHref(view.record.code.id)} download data-testid="record-pdf">
            {draft ? 'Download the draft PDF' : 'Download the signed PDF'}
          </a>
        </Button>
        <Button asChild variant="outline" size="lg">
          <RouterLink to={paths.records.verify.getHref()}>Check a printed record</RouterLink>
        </Button>
      </HStack>
    </Stack>
  );
}

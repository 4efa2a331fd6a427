import {
  Box,
  Button,
  Field,
  Heading,
  HStack,
  Input,
  List,
  SimpleGrid,
  Stack,
  Text,
} from '@chakra-ui/react';
import { verifyRecordSchema, type VerifyRecordResult } from '@steadyhand/shared';
import { useRef, useState } from 'react';
import { Link as RouterLink } from 'react-router';
import { ErrorMessage } from '../../../components/ui/error-message';
import { paths } from '../../../config/paths';
import { formatDateTime } from '../../../lib/format';
import { useVerifyRecord } from '../api/records-api';

function VerifyAnswer({ result }: { result: VerifyRecordResult }) {
  const r = result.record;
  return (
    <Stack
      gap="3"
      borderWidth="3px"
      borderRadius="l3"
      p="6"
      borderColor={result.valid ? 'seaglass.600' : 'alarm.600'}
      role="status"
      data-testid="verify-result"
      data-valid={result.valid ? 'true' : 'false'}
    >
      <Heading as="h2" textStyle="3xl" color={result.valid ? 'seaglass.700' : 'alarm.700'}>
        <span aria-hidden="true">{result.valid ? '✓ ' : '✕ '}</span>
        {result.valid ? 'Valid' : 'Not valid'}
      </Heading>
      <Text textStyle="lg">{result.reason}</Text>
      {r ? (
        <Stack gap="1">
          <Text>
            <strong>Record:</strong> {r.location ?? 'location not recorded'}, arrest{' '}
            {formatDateTime(r.arrestAt)} (id {r.id})
          </Text>
          <Text>
            <strong>Status:</strong>{' '}
            {r.status === 'signed'
              ? 'signed'
              : r.status === 'partly-signed'
                ? 'one signature of two'
                : 'not signed (draft)'}
          </Text>
          {r.signatures.length > 0 ? (
            <List.Root ps="5">
              {r.signatures.map((s) => (
                <List.Item key={`${s.meaning}-${s.signedAt}`}>
                  {s.meaningText} {s.printedName}, {formatDateTime(s.signedAt)}
                  {s.keyId ? `, server key ${s.keyId}` : ''}{' '}
                  {s.valid ? '(verified)' : '(does not verify)'}
                </List.Item>
              ))}
            </List.Root>
          ) : null}
          <Box>
            <Button asChild variant="plain" px="0">
              <RouterLink to={paths.codes.review.getHref(r.id)}>Open this record</RouterLink>
            </Button>
          </Box>
        </Stack>
      ) : null}
    </Stack>
  );
}

/**
 * Upload a PDF the product printed, or type the digest printed on it, and hear whether it is
 * the record as kept (and signed) now.
 */
export function VerifyRecord() {
  const verify = useVerifyRecord();
  const fileInput = useRef<HTMLInputElement>(null);
  const [digest, setDigest] = useState('');
  const [digestError, setDigestError] = useState<string | null>(null);

  return (
    <Stack gap="6">
      <SimpleGrid columns={{ base: 1, lg: 2 }} gap="6">
        <Stack gap="3" borderWidth="1px" borderRadius="l2" p="5" bg="bg.panel">
          <Heading as="h2" textStyle="xl">
            Upload the PDF
          </Heading>
          <Text color="fg.muted">
            The file is checked byte for byte against the copies this server issued, and its stamp
            against the server’s key.
          </Text>
          <input
            ref={fileInput}
            type="file"
            accept="application/pdf,.pdf"
            hidden
            data-testid="verify-file"
            onChange={(e) => {
              const file = e.currentTarget.files?.[0];
              e.currentTarget.value = '';
              if (file) verify.mutate({ file });
            }}
          />
          <Box>
            <Button
              colorPalette="brand"
              size="lg"
              onClick={() => fileInput.current?.click()}
              loading={verify.isPending}
            >
              Choose a PDF
            </Button>
          </Box>
        </Stack>
        <Stack
          as="form"
          gap="3"
          borderWidth="1px"
          borderRadius="l2"
          p="5"
          bg="bg.panel"
          onSubmit={(e) => {
            e.preventDefault();
            const parsed = verifyRecordSchema.safeParse({ digest });
            if (!parsed.success) {
              setDigestError(parsed.error.issues[0]?.message ?? 'Check the digest');
              return;
            }
            setDigestError(null);
            verify.mutate(parsed.data);
          }}
        >
          <Heading as="h2" textStyle="xl">
            Or type the digest
          </Heading>
          <Field.Root invalid={digestError !== null}>
            <Field.Label>SHA-256 digest printed on the record</Field.Label>
            <Input
              fontFamily="mono"
              value={digest}
              onChange={(e) => setDigest(e.currentTarget.value)}
              placeholder="64 characters, 0–9 and a–f"
              data-testid="verify-digest"
            />
            <Field.ErrorText>{digestError}</Field.ErrorText>
          </Field.Root>
          <HStack>
            <Button
              type="submit"
              variant="outline"
              size="lg"
              loading={verify.isPending}
              data-testid="verify-digest-submit"
            >
              Check the digest
            </Button>
          </HStack>
        </Stack>
      </SimpleGrid>
      {verify.error ? <ErrorMessage title="Not checked" message={verify.error.message} /> : null}
      {verify.data ? <VerifyAnswer result={verify.data} /> : null}
    </Stack>
  );
}

import {
  Alert,
  Box,
  Button,
  Field,
  Heading,
  Input,
  SimpleGrid,
  Stack,
  Text,
} from '@chakra-ui/react';
import {
  SIGNATURE_MEANING_ROLE,
  SIGNATURE_MEANING_TEXT,
  SIGNATURE_MEANINGS,
  type RecordSignature,
  type RecordView,
  type Role,
  type SignatureMeaning,
} from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { formatDateTime } from '../../../lib/format';
import { useSignRecord } from '../api/records-api';

/** What each signature says about the signer, in words shown before they sign. */
const MEANING_PROMISE: Record<SignatureMeaning, string> = {
  'recorded-by':
    'You recorded this code and the timeline is complete and correct to the best of your knowledge.',
  'reviewed-confirmed':
    'You led or reviewed this code and confirm the record, its details and its outcome.',
};

const ROLE_WORDS: Record<'recorder' | 'leader', string> = {
  recorder: 'a recorder',
  leader: 'a team leader',
};

interface SignatureSlotProps {
  codeId: string;
  meaning: SignatureMeaning;
  signature: RecordSignature | undefined;
  /** Why this reader cannot sign here, or null when they can. */
  blockedBecause: string | null;
}

function SignatureSlot({ codeId, meaning, signature, blockedBecause }: SignatureSlotProps) {
  const sign = useSignRecord(codeId);
  const [password, setPassword] = useState('');
  const inputId = `sign-password-${meaning}`;

  return (
    <Stack
      gap="3"
      borderWidth="1px"
      borderRadius="l2"
      p="5"
      bg="bg.panel"
      data-testid={`signature-${meaning}`}
      data-signed={signature ? 'true' : 'false'}
    >
      <Heading as="h3" textStyle="lg">
        {SIGNATURE_MEANING_TEXT[meaning]}
      </Heading>
      {signature ? (
        <Stack gap="1">
          <Text textStyle="xl" fontWeight="bold" data-testid="signature-name">
            {signature.printedName}
          </Text>
          <Text>{formatDateTime(signature.signedAt)}</Text>
          <Text
            fontWeight="bold"
            color={signature.valid ? 'seaglass.700' : 'alarm.700'}
            data-testid="signature-valid"
          >
            {signature.valid
              ? '✓ Signature verified against the record as signed'
              : '✕ This signature no longer matches the record'}
          </Text>
          {signature.keyId ? (
            <Text textStyle="sm" color="fg.muted" data-testid="signature-key">
              Server key {signature.keyId}
            </Text>
          ) : null}
        </Stack>
      ) : blockedBecause ? (
        <Text color="fg.muted">{blockedBecause}</Text>
      ) : (
        <Stack
          as="form"
          gap="3"
          onSubmit={(e) => {
            e.preventDefault();
            sign.mutate({ meaning, password }, { onSettled: () => setPassword('') });
          }}
        >
          <Text>{MEANING_PROMISE[meaning]} Type your password again to sign.</Text>
          <Field.Root required>
            <Field.Label htmlFor={inputId}>Your password</Field.Label>
            <Input
              id={inputId}
              type="password"
              autoComplete="current-password"
              value={password}
              onChange={(e) => setPassword(e.currentTarget.value)}
              data-testid="sign-password"
            />
          </Field.Root>
          <Box>
            <Button
              type="submit"
              colorPalette="brand"
              size="lg"
              loading={sign.isPending}
              loadingText="Signing…"
              disabled={!password}
              data-testid="sign-button"
            >
              Sign: {SIGNATURE_MEANING_TEXT[meaning].toLowerCase()} me
            </Button>
          </Box>
          {sign.error ? <ErrorMessage title="Not signed" message={sign.error.message} /> : null}
        </Stack>
      )}
    </Stack>
  );
}

interface SignaturesPanelProps {
  view: RecordView;
  user: { id: string; roles: readonly Role[] };
}

/**
 * Two signatures, by two different people: the recorder's and the team leader's. Each shows the
 * printed name, date and time and what it means, as on every printed copy.
 */
export function SignaturesPanel({ view, user }: SignaturesPanelProps) {
  const ended = view.record.code.status === 'ended';
  const signedByMe = view.signatures.some((s) => s.signerId === user.id);
  const blockedBecause = (meaning: SignatureMeaning): string | null => {
    const role = SIGNATURE_MEANING_ROLE[meaning];
    if (!ended) return 'The code is still running: the record is signed after it ends.';
    if (!user.roles.includes(role)) return `Waiting for ${ROLE_WORDS[role]} to sign.`;
    if (signedByMe)
      return 'Waiting for another person: the second signature must come from someone else.';
    return null;
  };

  return (
    <Stack as="section" gap="4" aria-labelledby="signatures-heading" data-testid="signatures">
      <Heading as="h2" id="signatures-heading" textStyle="2xl">
        Signatures
      </Heading>
      {view.status === 'draft' && ended ? (
        <Alert.Root status="info" variant="outline">
          <Alert.Indicator />
          <Alert.Title>
            After the first signature the details and the timeline are frozen: later changes go in
            as addenda, marked as added later.
          </Alert.Title>
        </Alert.Root>
      ) : null}
      <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
        {SIGNATURE_MEANINGS.map((meaning) => (
          <SignatureSlot
            key={meaning}
            codeId={view.record.code.id}
            meaning={meaning}
            signature={view.signatures.find((s) => s.meaning === meaning)}
            blockedBecause={blockedBecause(meaning)}
          />
        ))}
      </SimpleGrid>
    </Stack>
  );
}

import { Box, Button, Code, Field, Heading, HStack, Image, Input, List, Stack, Text } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { totpCodeSchema } from '@steadyhand/shared';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { isApiError } from '../../../lib/api-client';
import { useConfirmTotp, useStartTotp } from '../api/account';

const confirmSchema = z.object({ code: totpCodeSchema });

/** Base32 in groups of four, easier to type into an app by hand. */
const grouped = (secret: string) => secret.match(/.{1,4}/g)?.join(' ') ?? secret;

/** Set-up: a QR code and the secret in text, a first code to confirm, then the recovery codes once. */
export function SecondFactorSetup({ onDone }: { onDone: () => void }) {
  const start = useStartTotp();
  const confirm = useConfirmTotp();
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<{ code: string }>({ resolver: zodResolver(confirmSchema), defaultValues: { code: '' } });

  if (confirm.data) {
    return (
      <Stack gap="5" data-testid="recovery-codes">
        <Heading as="h2" textStyle="2xl">
          Save your recovery codes
        </Heading>
        <Text>
          If you lose your phone, each of these codes lets you in once. They are shown only now: print them or keep them
          somewhere safe, away from the phone.
        </Text>
        <List.Root as="ol" gap="1" ps="6">
          {confirm.data.map((code) => (
            <List.Item key={code}>
              <Code textStyle="lg">{code}</Code>
            </List.Item>
          ))}
        </List.Root>
        <div>
          <Button colorPalette="brand" size="lg" onClick={onDone}>
            I have saved them
          </Button>
        </div>
      </Stack>
    );
  }

  if (!start.data) {
    return (
      <Stack gap="4" align="flex-start">
        <Text>
          You will need an authenticator app on your phone (for example the one your hospital recommends). Steadyhand
          shows a QR code to scan with it.
        </Text>
        {start.isError ? <ErrorMessage message={isApiError(start.error) ? start.error.message : 'Cannot reach Steadyhand.'} /> : null}
        <Button colorPalette="brand" size="lg" loading={start.isPending} onClick={() => start.mutate()}>
          Set up an authenticator
        </Button>
      </Stack>
    );
  }

  const onSubmit = handleSubmit(({ code }) => confirm.mutate(code));
  return (
    <Stack gap="6">
      <HStack gap="8" align="flex-start" wrap="wrap">
        <Box bg="white" p="3" borderRadius="l2" borderWidth="1px">
          <Image src={start.data.qrDataUrl} alt="QR code to scan with your authenticator app" width="240px" height="240px" data-testid="totp-qr" />
        </Box>
        <Stack gap="3" maxW="md">
          <Text>1. Scan this code with your authenticator app.</Text>
          <Text>2. Cannot scan? Type this key into the app instead:</Text>
          <Code textStyle="xl" p="2" data-testid="totp-secret" data-secret={start.data.secret}>
            {grouped(start.data.secret)}
          </Code>
          <Text>3. Enter the 6-digit code the app now shows.</Text>
        </Stack>
      </HStack>
      <form
        noValidate
        aria-label="Confirm authenticator"
        onSubmit={(event) => {
          void onSubmit(event);
        }}
      >
        <Stack gap="4" maxW="sm">
          {confirm.isError ? (
            <ErrorMessage message={isApiError(confirm.error) ? confirm.error.message : 'Cannot reach Steadyhand.'} />
          ) : null}
          <Field.Root invalid={Boolean(errors.code)} required>
            <Field.Label>Code from the app</Field.Label>
            <Input {...register('code')} inputMode="numeric" autoComplete="one-time-code" bg="bg.panel" />
            <Field.ErrorText>{errors.code?.message}</Field.ErrorText>
          </Field.Root>
          <div>
            <Button type="submit" colorPalette="brand" size="lg" loading={confirm.isPending} loadingText="Checking…">
              Turn on
            </Button>
          </div>
        </Stack>
      </form>
    </Stack>
  );
}

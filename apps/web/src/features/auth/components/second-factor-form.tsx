import { Button, Field, Input, Stack, Text } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { recoveryCodeSchema, totpCodeSchema, type PublicUser } from '@steadyhand/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { isApiError } from '../../../lib/api-client';
import { useSecondFactor } from '../api/login';
import { tooManyAttemptsMessage } from './sign-in-messages';

const codeForm = z.object({ value: totpCodeSchema });
const recoveryForm = z.object({ value: recoveryCodeSchema });

function secondFactorErrorMessage(error: unknown): string {
  if (isApiError(error)) {
    if (error.status === 401) return 'That code is not right. Use the newest code from your app.';
    if (error.status === 429) return tooManyAttemptsMessage(error.retryAfterSeconds);
    if (error.status === 400) return 'Sign in with your password again, then enter the code.';
    return error.message;
  }
  return 'Cannot reach Steadyhand. Check the network connection and try again.';
}

interface SecondFactorFormProps {
  onDone: (user: PublicUser) => void;
  /** A step-up inside a signed-in session keeps what is cached. */
  stepUp?: boolean;
}

/** The second step: the 6 digits from an authenticator app, or one recovery code. */
export function SecondFactorForm({ onDone, stepUp = false }: SecondFactorFormProps) {
  const [useRecovery, setUseRecovery] = useState(false);
  const mutation = useSecondFactor({ onSuccess: onDone, keepCache: stepUp });
  const {
    register,
    handleSubmit,
    reset,
    formState: { errors },
  } = useForm<{ value: string }>({ resolver: zodResolver(useRecovery ? recoveryForm : codeForm), defaultValues: { value: '' } });

  const onSubmit = handleSubmit(({ value }) => {
    mutation.mutate(useRecovery ? { recoveryCode: value } : { code: value });
  });

  return (
    <form
      noValidate
      aria-label="Second step"
      onSubmit={(event) => {
        void onSubmit(event);
      }}
    >
      <Stack gap="6">
        <Text>
          {useRecovery
            ? 'Enter one of the recovery codes you saved when you set up your authenticator. Each works once.'
            : 'Open your authenticator app and enter the 6-digit code it shows for Steadyhand.'}
        </Text>
        {mutation.isError ? <ErrorMessage message={secondFactorErrorMessage(mutation.error)} /> : null}
        <Field.Root invalid={Boolean(errors.value)} required>
          <Field.Label>{useRecovery ? 'Recovery code' : 'Authenticator code'}</Field.Label>
          <Input
            {...register('value')}
            autoComplete="one-time-code"
            inputMode={useRecovery ? 'text' : 'numeric'}
            autoCapitalize="none"
            spellCheck={false}
            bg="bg.panel"
            data-testid="second-factor-input"
          />
          <Field.ErrorText>{errors.value?.message}</Field.ErrorText>
        </Field.Root>
        <Button type="submit" colorPalette="brand" size="lg" loading={mutation.isPending} loadingText="Checking…">
          Confirm
        </Button>
        <Button
          variant="ghost"
          onClick={() => {
            setUseRecovery((v) => !v);
            reset({ value: '' });
            mutation.reset();
          }}
        >
          {useRecovery ? 'Use a code from the app instead' : 'Use a recovery code instead'}
        </Button>
      </Stack>
    </form>
  );
}

import { Button, Field, Input, Stack } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { loginRequestSchema, type LoginRequest, type PublicUser } from '@steadyhand/shared';
import { useCallback, useState, type ReactNode } from 'react';
import { useForm } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useLogin } from '../api/login';
import { SecondFactorForm } from './second-factor-form';
import { signInErrorMessage } from './sign-in-messages';

interface SignInFormProps {
  onSignedIn: (user: PublicUser) => void;
  /** Optional extra below the form, given a way to fill the username (the demo accounts). */
  renderHelp?: (fillUsername: (username: string) => void) => ReactNode;
}

export function SignInForm({ onSignedIn, renderHelp }: SignInFormProps) {
  const {
    register,
    handleSubmit,
    setValue,
    setFocus,
    formState: { errors },
  } = useForm<LoginRequest>({
    resolver: zodResolver(loginRequestSchema),
    defaultValues: { username: '', password: '' },
  });
  // Set when the password was right and the account asks for its second factor.
  const [awaitingCode, setAwaitingCode] = useState(false);
  const loginMutation = useLogin({ onSuccess: onSignedIn, onSecondFactor: () => setAwaitingCode(true) });

  const fillUsername = useCallback(
    (username: string) => {
      setValue('username', username, { shouldValidate: true });
      setFocus('password');
    },
    [setValue, setFocus],
  );

  const onSubmit = handleSubmit((values) => {
    loginMutation.mutate(values);
  });

  if (awaitingCode) return <SecondFactorForm onDone={onSignedIn} />;

  return (
    <Stack gap="8">
      <form
        noValidate
        aria-label="Sign in"
        onSubmit={(event) => {
          void onSubmit(event);
        }}
      >
        <Stack gap="6">
          {loginMutation.isError ? <ErrorMessage message={signInErrorMessage(loginMutation.error)} /> : null}

          <Field.Root invalid={Boolean(errors.username)} required>
            <Field.Label>Username</Field.Label>
            <Input
              {...register('username')}
              autoComplete="username"
              autoCapitalize="none"
              autoCorrect="off"
              spellCheck={false}
              bg="bg.panel"
            />
            <Field.ErrorText>{errors.username?.message}</Field.ErrorText>
          </Field.Root>

          <Field.Root invalid={Boolean(errors.password)} required>
            <Field.Label>Password</Field.Label>
            <Input {...register('password')} type="password" autoComplete="current-password" bg="bg.panel" />
            <Field.ErrorText>{errors.password?.message}</Field.ErrorText>
          </Field.Root>

          <Button type="submit" colorPalette="brand" size="lg" loading={loginMutation.isPending} loadingText="Signing in…">
            Sign in
          </Button>
        </Stack>
      </form>
      {renderHelp?.(fillUsername)}
    </Stack>
  );
}

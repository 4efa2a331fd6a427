import { Button, Field, Input, Stack } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { changePasswordSchema, MIN_PASSWORD_LENGTH, type ChangePasswordRequest, textSchema } from '@steadyhand/shared';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { isApiError } from '../../../lib/api-client';
import { useChangePassword } from '../api/account';

const formSchema = changePasswordSchema
  .extend({ repeat: textSchema() })
  .refine((v) => v.repeat === v.newPassword, { path: ['repeat'], message: 'The two new passwords differ' });
type FormValues = z.infer<typeof formSchema>;

/** Any length from 12 characters, no rules about symbols; a well-known password is refused by the server. */
export function ChangePasswordForm({ onChanged }: { onChanged: () => void }) {
  const mutation = useChangePassword({ onSuccess: onChanged });
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<FormValues>({ resolver: zodResolver(formSchema), defaultValues: { currentPassword: '', newPassword: '', repeat: '' } });

  const onSubmit = handleSubmit(({ currentPassword, newPassword }: ChangePasswordRequest) => {
    mutation.mutate({ currentPassword, newPassword });
  });

  return (
    <form
      noValidate
      aria-label="Change password"
      onSubmit={(event) => {
        void onSubmit(event);
      }}
    >
      <Stack gap="5" maxW="lg">
        {mutation.isError ? (
          <ErrorMessage message={isApiError(mutation.error) ? mutation.error.message : 'Cannot reach Steadyhand. Try again.'} />
        ) : null}
        <Field.Root invalid={Boolean(errors.currentPassword)} required>
          <Field.Label>Current password</Field.Label>
          <Input {...register('currentPassword')} type="password" autoComplete="current-password" bg="bg.panel" />
          <Field.ErrorText>{errors.currentPassword?.message}</Field.ErrorText>
        </Field.Root>
        <Field.Root invalid={Boolean(errors.newPassword)} required>
          <Field.Label>New password</Field.Label>
          <Input {...register('newPassword')} type="password" autoComplete="new-password" bg="bg.panel" />
          <Field.HelperText>At least {MIN_PASSWORD_LENGTH} characters. A short sentence is easy to remember.</Field.HelperText>
          <Field.ErrorText>{errors.newPassword?.message}</Field.ErrorText>
        </Field.Root>
        <Field.Root invalid={Boolean(errors.repeat)} required>
          <Field.Label>New password again</Field.Label>
          <Input {...register('repeat')} type="password" autoComplete="new-password" bg="bg.panel" />
          <Field.ErrorText>{errors.repeat?.message}</Field.ErrorText>
        </Field.Root>
        <div>
          <Button type="submit" colorPalette="brand" size="lg" loading={mutation.isPending} loadingText="Saving…">
            Save new password
          </Button>
        </div>
      </Stack>
    </form>
  );
}

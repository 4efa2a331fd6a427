import { Button, Field, Input, SimpleGrid, Stack } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { createUserSchema, MIN_PASSWORD_LENGTH, type CreateUserRequest } from '@steadyhand/shared';
import { Controller, useForm } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { isApiError } from '../../../lib/api-client';
import { useCreateUser } from '../api/admin';
import { RoleCheckboxes } from './role-checkboxes';

const empty: CreateUserRequest = { username: '', displayName: '', password: '', roles: [] };

/** A new person gets a temporary password from the admin and must choose their own at first sign-in. */
export function AddPersonForm({ onAdded }: { onAdded: (name: string) => void }) {
  const create = useCreateUser();
  const {
    register,
    handleSubmit,
    control,
    reset,
    formState: { errors },
  } = useForm<CreateUserRequest>({ resolver: zodResolver(createUserSchema), defaultValues: empty });

  const onSubmit = handleSubmit((values) =>
    create.mutate(values, {
      onSuccess: (user) => {
        reset(empty);
        onAdded(user.displayName);
      },
    }),
  );

  return (
    <form
      noValidate
      aria-label="Add a person"
      onSubmit={(event) => {
        void onSubmit(event);
      }}
    >
      <Stack gap="5">
        {create.isError ? <ErrorMessage message={isApiError(create.error) ? create.error.message : 'Cannot reach Steadyhand.'} /> : null}
        <SimpleGrid columns={{ base: 1, md: 3 }} gap="4">
          <Field.Root invalid={Boolean(errors.displayName)} required>
            <Field.Label>Full name</Field.Label>
            <Input {...register('displayName')} bg="bg.panel" autoComplete="off" />
            <Field.ErrorText>{errors.displayName?.message}</Field.ErrorText>
          </Field.Root>
          <Field.Root invalid={Boolean(errors.username)} required>
            <Field.Label>Username</Field.Label>
            <Input {...register('username')} bg="bg.panel" autoCapitalize="none" autoComplete="off" spellCheck={false} />
            <Field.ErrorText>{errors.username?.message}</Field.ErrorText>
          </Field.Root>
          <Field.Root invalid={Boolean(errors.password)} required>
            <Field.Label>Temporary password</Field.Label>
            <Input {...register('password')} type="password" bg="bg.panel" autoComplete="new-password" />
            <Field.HelperText>At least {MIN_PASSWORD_LENGTH} characters; they choose their own at first sign-in.</Field.HelperText>
            <Field.ErrorText>{errors.password?.message}</Field.ErrorText>
          </Field.Root>
        </SimpleGrid>
        <Controller
          control={control}
          name="roles"
          render={({ field }) => <RoleCheckboxes legend="Roles" name="new-person-roles" value={field.value} onChange={field.onChange} />}
        />
        <div>
          <Button type="submit" colorPalette="brand" size="lg" loading={create.isPending} loadingText="Adding…">
            Add person
          </Button>
        </div>
      </Stack>
    </form>
  );
}

import { Button, Field, HStack, Stack, Textarea } from '@chakra-ui/react';
import type { RecordStatus } from '@steadyhand/shared';
import { useForm } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useAddRecordEntry } from '../api/records-api';

/**
 * A note added at review: something learned after the code (a strip read later, a detail from the
 * team). Once the record is signed it is an addendum, marked as such in the timeline and on paper.
 */
export function NoteForm({ codeId, status }: { codeId: string; status: RecordStatus }) {
  const add = useAddRecordEntry(codeId, status);
  const form = useForm<{ text: string }>({ defaultValues: { text: '' } });
  const addendum = status !== 'draft';
  const submit = form.handleSubmit(({ text }) => {
    const trimmed = text.trim();
    if (!trimmed) {
      form.setError('text', { message: 'Write the note first.' });
      return;
    }
    const now = new Date().toISOString();
    add.mutate(
      { id: crypto.randomUUID(), kind: 'note', at: now, text: trimmed, deviceId: 'review' },
      { onSuccess: () => form.reset() },
    );
  });

  return (
    <Stack asChild gap="3">
      <form onSubmit={(e) => void submit(e)} noValidate data-testid="note-form">
        <Field.Root invalid={form.formState.errors.text !== undefined}>
          <Field.Label>
            {addendum ? 'Add an addendum to the signed record' : 'Add a note to the timeline'}
          </Field.Label>
          <Textarea rows={2} maxLength={2000} {...form.register('text')} data-testid="note-text" />
          <Field.ErrorText>{form.formState.errors.text?.message}</Field.ErrorText>
        </Field.Root>
        <HStack>
          <Button
            type="submit"
            variant="outline"
            size="lg"
            loading={add.isPending}
            loadingText="Adding…"
            data-testid="note-add"
          >
            {addendum ? 'Add the addendum' : 'Add the note'}
          </Button>
        </HStack>
        {add.error ? <ErrorMessage title="Not added" message={add.error.message} /> : null}
      </form>
    </Stack>
  );
}

import { Button, Field, Grid, Heading, Input, NativeSelect, Stack, Textarea } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import type { ReconciliationView } from '@steadyhand/shared';
import { useForm } from 'react-hook-form';
import { textSchema } from '@steadyhand/shared';
import { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useAddReconciliationAddendum } from '../api/pharmacy-api';

const schema = z
  .object({
    text: textSchema().trim().min(1, 'say what the addendum is about').max(2000),
    drugKey: textSchema(),
    unitsOpened: z.number().int().min(0).max(500).or(z.nan()),
    unitsWasted: z.number().int().min(0).max(500).or(z.nan()),
  })
  .refine((v) => v.drugKey === '' || Number.isFinite(v.unitsOpened), { message: 'enter the corrected units opened', path: ['unitsOpened'] });
type Values = z.infer<typeof schema>;

/** After sign-off: a note, and optionally corrected counts for one drug. */
export function AddendumForm({ view }: { view: ReconciliationView }) {
  const add = useAddReconciliationAddendum(view.code.id);
  const form = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { text: '', drugKey: '', unitsOpened: Number.NaN, unitsWasted: Number.NaN } });
  const submit = form.handleSubmit((v) => {
    const before = view.lines.find((l) => l.drugKey === v.drugKey);
    const lines = v.drugKey
      ? [{ drugKey: v.drugKey, unitsOpened: v.unitsOpened, unitsWasted: Number.isFinite(v.unitsWasted) ? v.unitsWasted : 0, wasteWitness: before?.wasteWitness ?? null, lotNumbers: before?.lotNumbers ?? null }]
      : [];
    add.mutate({ text: v.text, lines }, { onSuccess: () => form.reset() });
  });
  return (
    <form onSubmit={(e) => void submit(e)} noValidate>
      <Stack gap="3" borderWidth="1px" borderRadius="l2" p="4">
        <Heading as="h3" textStyle="lg">
          Add an addendum
        </Heading>
        <Field.Root invalid={form.formState.errors.text !== undefined} required>
          <Field.Label>What changed, and why</Field.Label>
          <Textarea {...form.register('text')} rows={2} data-testid="addendum-text" />
          <Field.ErrorText>{form.formState.errors.text?.message}</Field.ErrorText>
        </Field.Root>
        <Grid templateColumns={{ base: '1fr', md: '2fr 1fr 1fr' }} gap="3">
          <Field.Root>
            <Field.Label>Corrected counts for (optional)</Field.Label>
            <NativeSelect.Root>
              <NativeSelect.Field {...form.register('drugKey')}>
                <option value="">No count changes</option>
                {view.rows.map((r) => (
                  <option key={r.drugKey} value={r.drugKey}>
                    {r.label}
                  </option>
                ))}
              </NativeSelect.Field>
              <NativeSelect.Indicator />
            </NativeSelect.Root>
          </Field.Root>
          <Field.Root invalid={form.formState.errors.unitsOpened !== undefined}>
            <Field.Label>Units opened</Field.Label>
            <Input type="number" min={0} {...form.register('unitsOpened', { valueAsNumber: true })} />
            <Field.ErrorText>{form.formState.errors.unitsOpened?.message}</Field.ErrorText>
          </Field.Root>
          <Field.Root>
            <Field.Label>Units wasted</Field.Label>
            <Input type="number" min={0} {...form.register('unitsWasted', { valueAsNumber: true })} />
          </Field.Root>
        </Grid>
        {add.error ? <ErrorMessage title="Not added" message={add.error.message} /> : null}
        <div>
          <Button type="submit" size="lg" variant="outline" loading={add.isPending} data-testid="add-addendum">
            Add addendum
          </Button>
        </div>
      </Stack>
    </form>
  );
}

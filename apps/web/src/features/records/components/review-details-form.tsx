import {
  Button,
  Field,
  Heading,
  HStack,
  IconButton,
  Input,
  NativeSelect,
  SimpleGrid,
  Stack,
  Text,
  Textarea,
} from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { END_OUTCOME_CHOICES, OUTCOMES, type RecordCode, type ReviewDetailsRequest, textSchema } from '@steadyhand/shared';
import { useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import { z } from 'zod';
import { ErrorMessage } from '../../../components/ui/error-message';
import { OUTCOME_WORDS } from '../../../lib/live/entry-words';
import { useSaveReviewDetails } from '../api/records-api';

// The form holds text; blanks mean "not recorded". The server's schema checks the request again.
const formSchema = z.object({
  patientName: textSchema().trim().max(120),
  mrn: textSchema().trim().max(40),
  birthDate: z.union([
    z.literal(''),
    z.iso.date({ message: 'Birth date: use the date picker, or leave it empty' }),
  ]),
  sex: z.enum(['', 'female', 'male', 'unknown']),
  location: textSchema().trim().max(120),
  outcome: z.enum(OUTCOMES),
  team: z
    .array(
      z.object({
        name: textSchema().trim().min(1, 'Name is required').max(120),
        role: textSchema().trim().min(1, 'Role is required').max(60),
      }),
    )
    .max(40),
  debriefNotes: textSchema().max(5000),
});
type FormValues = z.infer<typeof formSchema>;

function toForm(code: RecordCode): FormValues {
  return {
    patientName: code.patient?.name ?? '',
    mrn: code.patient?.mrn ?? '',
    birthDate: code.patient?.birthDate ?? '',
    sex: code.patient?.sex ?? '',
    location: code.location ?? '',
    // The older word for ending in ROSC shows as the current one: it means the same.
    outcome: code.outcome === 'sustained-rosc' ? 'rosc' : (code.outcome ?? 'other'),
    team: code.team,
    debriefNotes: code.debriefNotes ?? '',
  };
}

/** Only what changed goes to the server, so the audit trail lists real changes. */
function toRequest(
  values: FormValues,
  dirty: Partial<Record<keyof FormValues, unknown>>,
): ReviewDetailsRequest {
  const request: ReviewDetailsRequest = {};
  if (dirty.patientName || dirty.mrn || dirty.birthDate || dirty.sex) {
    const patient = {
      ...(values.patientName ? { name: values.patientName } : {}),
      ...(values.mrn ? { mrn: values.mrn } : {}),
      ...(values.birthDate ? { birthDate: values.birthDate } : {}),
      ...(values.sex ? { sex: values.sex } : {}),
    };
    request.patient = Object.keys(patient).length > 0 ? patient : null;
  }
  if (dirty.location) request.location = values.location || null;
  if (dirty.outcome) request.outcome = values.outcome;
  if (dirty.team) request.team = values.team;
  if (dirty.debriefNotes) request.debriefNotes = values.debriefNotes.trim() || null;
  return request;
}

interface ReviewDetailsFormProps {
  code: RecordCode;
  /** False once the record carries a signature, or for a reader who may not write. */
  editable: boolean;
}

/** Patient, place, outcome, who was in the team and in which role, and the debrief notes. */
export function ReviewDetailsForm({ code, editable }: ReviewDetailsFormProps) {
  const save = useSaveReviewDetails(code.id);
  const [saved, setSaved] = useState(false);
  const form = useForm<FormValues>({
    resolver: zodResolver(formSchema),
    values: toForm(code),
    // A refetch after another change (a correction, an upload) keeps what is being typed here.
    resetOptions: { keepDirtyValues: true },
  });
  const team = useFieldArray({ control: form.control, name: 'team' });
  const { errors, isDirty, dirtyFields } = form.formState;

  const submit = form.handleSubmit((values) => {
    setSaved(false);
    save.mutate(toRequest(values, dirtyFields), {
      onSuccess: () => {
        form.reset(values);
        setSaved(true);
      },
    });
  });

  return (
    <Stack asChild gap="5">
      <form
        onSubmit={(e) => void submit(e)}
        noValidate
        data-testid="review-details"
        aria-labelledby="details-heading"
      >
        <Heading as="h2" id="details-heading" textStyle="2xl">
          Details of the code
        </Heading>
        {!editable ? (
          <Text color="fg.muted">
            The record is signed: these details are frozen. Add a note as an addendum to the
            timeline instead.
          </Text>
        ) : null}
        <fieldset disabled={!editable}>
          <Stack gap="5">
            <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
              <Field.Root invalid={errors.patientName !== undefined}>
                <Field.Label>Patient name</Field.Label>
                <Input
                  {...form.register('patientName')}
                  placeholder="Unknown patient"
                  data-testid="details-patient-name"
                />
              </Field.Root>
              <Field.Root invalid={errors.mrn !== undefined}>
                <Field.Label>Medical record number</Field.Label>
                <Input {...form.register('mrn')} data-testid="details-mrn" />
              </Field.Root>
              <Field.Root invalid={errors.birthDate !== undefined}>
                <Field.Label>Birth date</Field.Label>
                <Input type="date" {...form.register('birthDate')} />
                <Field.ErrorText>{errors.birthDate?.message}</Field.ErrorText>
              </Field.Root>
              <Field.Root>
                <Field.Label>Sex</Field.Label>
                <NativeSelect.Root>
                  <NativeSelect.Field {...form.register('sex')}>
                    <option value="">Not recorded</option>
                    <option value="female">Female</option>
                    <option value="male">Male</option>
                    <option value="unknown">Unknown</option>
                  </NativeSelect.Field>
                  <NativeSelect.Indicator />
                </NativeSelect.Root>
              </Field.Root>
              <Field.Root>
                <Field.Label>Location</Field.Label>
                <Input {...form.register('location')} placeholder="Unit, room, bed" />
              </Field.Root>
              <Field.Root>
                <Field.Label>Outcome</Field.Label>
                <NativeSelect.Root>
                  <NativeSelect.Field {...form.register('outcome')} data-testid="details-outcome">
                    {END_OUTCOME_CHOICES.map((o) => (
                      <option key={o} value={o}>
                        {OUTCOME_WORDS[o]}
                      </option>
                    ))}
                  </NativeSelect.Field>
                  <NativeSelect.Indicator />
                </NativeSelect.Root>
                <Field.HelperText>
                  A changed outcome amends the code&apos;s end entry; the first one stays visible.
                </Field.HelperText>
              </Field.Root>
            </SimpleGrid>

            <Stack gap="3">
              <Heading as="h3" textStyle="lg">
                Team members and their roles in the code
              </Heading>
              {team.fields.length === 0 ? <Text color="fg.muted">No one listed yet.</Text> : null}
              {team.fields.map((member, index) => (
                <HStack key={member.id} align="start" gap="3" data-testid="team-member">
                  <Field.Root invalid={errors.team?.[index]?.name !== undefined}>
                    <Field.Label srOnly>Name of team member {index + 1}</Field.Label>
                    <Input {...form.register(`team.${index}.name`)} placeholder="Name" />
                    <Field.ErrorText>{errors.team?.[index]?.name?.message}</Field.ErrorText>
                  </Field.Root>
                  <Field.Root invalid={errors.team?.[index]?.role !== undefined}>
                    <Field.Label srOnly>Role of team member {index + 1}</Field.Label>
                    <Input
                      {...form.register(`team.${index}.role`)}
                      placeholder="Role, e.g. Compressions"
                    />
                    <Field.ErrorText>{errors.team?.[index]?.role?.message}</Field.ErrorText>
                  </Field.Root>
                  <IconButton
                    variant="ghost"
                    aria-label={`Remove team member ${index + 1}`}
                    onClick={() => team.remove(index)}
                  >
                    ✕
                  </IconButton>
                </HStack>
              ))}
              <Button
                variant="outline"
                alignSelf="start"
                onClick={() => team.append({ name: '', role: '' })}
                data-testid="add-team-member"
              >
                Add a team member
              </Button>
            </Stack>

            <Field.Root>
              <Field.Label>Debrief notes</Field.Label>
              <Textarea
                rows={4}
                {...form.register('debriefNotes')}
                placeholder="What went well, what to change next time"
                data-testid="details-debrief"
              />
            </Field.Root>
          </Stack>
        </fieldset>
        {editable ? (
          <HStack gap="3">
            <Button
              type="submit"
              colorPalette="brand"
              size="lg"
              loading={save.isPending}
              loadingText="Saving…"
              disabled={!isDirty}
              data-testid="details-save"
            >
              Save the details
            </Button>
            {saved && !isDirty ? <Text role="status">Saved.</Text> : null}
          </HStack>
        ) : null}
        {save.error ? <ErrorMessage title="Not saved" message={save.error.message} /> : null}
      </form>
    </Stack>
  );
}

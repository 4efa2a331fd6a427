import {
  Button,
  Field,
  Heading,
  HStack,
  Input,
  NativeSelect,
  SimpleGrid,
  Stack,
  Text,
} from '@chakra-ui/react';
import {
  followUpProblems,
  NEUROLOGICAL_OUTCOME_WORDS,
  NEUROLOGICAL_OUTCOMES,
  STATUS_30_DAYS,
  STATUS_30_DAYS_WORDS,
  SURVIVAL_TO_DISCHARGE,
  SURVIVAL_WORDS,
  type FollowUp,
  type FollowUpItem,
  type FollowUpRequest,
  type FollowUpValues,
} from '@steadyhand/shared';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useSaveFollowUp } from '../api/follow-up';
import { formatDateTime } from './words';

interface Row {
  item: FollowUpItem;
  label: string;
  dateLabel: string;
  options: readonly (readonly [string, string])[];
}

const ROWS: Row[] = [
  {
    item: 'survivalToDischarge',
    label: 'Survival to hospital discharge',
    dateLabel: 'Day of discharge, or of death in hospital',
    options: SURVIVAL_TO_DISCHARGE.map((v) => [v, SURVIVAL_WORDS[v]] as const),
  },
  {
    item: 'status30Days',
    label: 'Status 30 days after the arrest',
    dateLabel: 'Day it was found out (for dead: the day of death)',
    options: STATUS_30_DAYS.map((v) => [v, STATUS_30_DAYS_WORDS[v]] as const),
  },
  {
    item: 'neurologicalOutcome',
    label: 'Neurological outcome at discharge (CPC or mRS)',
    dateLabel: 'Day it was assessed',
    options: NEUROLOGICAL_OUTCOMES.map((v) => [v, NEUROLOGICAL_OUTCOME_WORDS[v]] as const),
  },
];

type Draft = Record<FollowUpItem | `${FollowUpItem}Date`, string>;

function toDraft(f: FollowUp): Draft {
  return {
    survivalToDischarge: f.survivalToDischarge?.value ?? '',
    survivalToDischargeDate: f.survivalToDischarge?.date ?? '',
    status30Days: f.status30Days?.value ?? '',
    status30DaysDate: f.status30Days?.date ?? '',
    neurologicalOutcome: f.neurologicalOutcome?.value ?? '',
    neurologicalOutcomeDate: f.neurologicalOutcome?.date ?? '',
  };
}

/**
 * The reviewer's follow-up after the event: each answer with its date, who entered it and when.
 * It stays open after the review is signed off: the 30-day status often comes later.
 */
export function FollowUpPanel({
  codeId,
  arrestAt,
  followUp,
  open,
}: {
  codeId: string;
  arrestAt: string;
  followUp: FollowUp;
  open: boolean;
}) {
  const save = useSaveFollowUp(codeId);
  const [draft, setDraft] = useState<Draft>(() => toDraft(followUp));
  const [saved, setSaved] = useState(false);
  const stored = toDraft(followUp);
  const set = (k: keyof Draft, v: string) => {
    setDraft((d) => ({ ...d, [k]: v }));
    setSaved(false);
  };
  const values = Object.fromEntries(
    Object.entries(draft).map(([k, v]) => [k, v || null]),
  ) as FollowUpValues;
  const today = new Date().toISOString().slice(0, 10);
  const problems = followUpProblems(values, { arrestAt }, today);
  const errorOf = (k: string) => problems.find((p) => p.path === k)?.message;
  const body = Object.fromEntries(
    (Object.keys(draft) as (keyof Draft)[])
      .filter((k) => draft[k] !== stored[k])
      .map((k) => [k, draft[k] || null]),
  ) as FollowUpRequest;
  const changed = Object.keys(body).length > 0;

  const submit = () =>
    save.mutate(body, {
      onSuccess: (f) => {
        setDraft(toDraft(f));
        setSaved(true);
      },
    });

  return (
    <Stack
      gap="5"
      as="section"
      aria-labelledby="follow-up-heading"
      data-testid="follow-up"
      data-complete={followUp.complete}
    >
      <Stack gap="1">
        <Heading as="h2" id="follow-up-heading" textStyle="2xl">
          Follow-up after the code
        </Heading>
        <Text data-testid="follow-up-status">
          {followUp.complete ? (
            <>
              <span aria-hidden="true">✓ </span>Complete.
            </>
          ) : (
            `Waiting for: ${followUp.missing.join(', ')}.`
          )}
        </Text>
      </Stack>
      {!open ? (
        <Text>The code has not ended yet: its follow-up is entered after it ends.</Text>
      ) : null}
      <fieldset disabled={!open}>
        <Stack gap="5">
          {ROWS.map((row) => {
            const answer = followUp[row.item];
            const id = `follow-up-${row.item}`;
            return (
              <Stack key={row.item} gap="2">
                <SimpleGrid columns={{ base: 1, md: 2 }} gap="4">
                  <Field.Root invalid={errorOf(row.item) !== undefined}>
                    <Field.Label htmlFor={id}>{row.label}</Field.Label>
                    <NativeSelect.Root>
                      <NativeSelect.Field
                        id={id}
                        data-testid={id}
                        value={draft[row.item]}
                        onChange={(e) => set(row.item, e.currentTarget.value)}
                      >
                        <option value="">Not entered</option>
                        {row.options.map(([v, w]) => (
                          <option key={v} value={v}>
                            {w}
                          </option>
                        ))}
                      </NativeSelect.Field>
                      <NativeSelect.Indicator />
                    </NativeSelect.Root>
                    <Field.ErrorText>{errorOf(row.item)}</Field.ErrorText>
                  </Field.Root>
                  <Field.Root invalid={errorOf(`${row.item}Date`) !== undefined}>
                    <Field.Label htmlFor={`${id}-date`}>{row.dateLabel}</Field.Label>
                    <Input
                      id={`${id}-date`}
                      data-testid={`${id}-date`}
                      type="date"
                      max={today}
                      value={draft[`${row.item}Date`]}
                      onChange={(e) => set(`${row.item}Date`, e.currentTarget.value)}
                    />
                    <Field.ErrorText>{errorOf(`${row.item}Date`)}</Field.ErrorText>
                  </Field.Root>
                </SimpleGrid>
                {answer ? (
                  <Text textStyle="sm" color="fg.muted">
                    Entered by {answer.enteredBy.displayName} on {formatDateTime(answer.enteredAt)}.
                  </Text>
                ) : null}
              </Stack>
            );
          })}
        </Stack>
      </fieldset>
      {open ? (
        <HStack gap="3">
          <Button
            colorPalette="brand"
            size="lg"
            onClick={submit}
            loading={save.isPending}
            disabled={!changed || problems.length > 0}
            data-testid="follow-up-save"
          >
            Save the follow-up
          </Button>
          {saved && !changed ? <Text role="status">Saved.</Text> : null}
        </HStack>
      ) : null}
      {save.isError ? <ErrorMessage title="Not saved" message={save.error.message} /> : null}
    </Stack>
  );
}

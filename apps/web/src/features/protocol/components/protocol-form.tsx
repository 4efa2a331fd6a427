import { Alert, Box, Button, Dialog, Flex, Heading, Portal, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import { zodResolver } from '@hookform/resolvers/zod';
import { protocolSettingsSchema, type ProtocolDocument, type ProtocolSettings } from '@steadyhand/shared';
import dayjs from 'dayjs';
import { useMemo, useState, type ReactNode } from 'react';
import { FormProvider, useForm, type FieldPath, type Resolver } from 'react-hook-form';
import { ErrorMessage } from '../../../components/ui/error-message';
import { isApiError } from '../../../lib/api-client';
import { useResetProtocol, useSaveProtocol } from '../api/save-protocol';
import { DrugCatalogue } from './drug-catalogue';
import { friendlyError, NumberField, NumberListField, SecondsField, TextField } from './form-fields';

export const PROTOCOL_CAUTION =
  "These values drive the reminders and dose suggestions on every screen. They support, and do not replace, the team leader's judgment, local protocol and licensed practice. Check every change against your institution's protocol and formulary.";

/** Fields left empty are left out (no blank limits), so the stored settings say only what was set. */
function tidy(values: ProtocolSettings): ProtocolSettings {
  return JSON.parse(JSON.stringify(values)) as ProtocolSettings;
}

function lastChanged(doc: ProtocolDocument): string {
  if (!doc.updatedAt) return 'Published defaults: not changed here yet.';
  const when = dayjs(doc.updatedAt).format('D MMM YYYY [at] HH:mm');
  return `Last changed by ${doc.updatedBy ?? 'an unknown person'} on ${when}.`;
}

function Section({ title, description, children }: { title: string; description?: string; children: ReactNode }) {
  const id = `protocol-section-${title.toLowerCase().replace(/[^a-z]+/g, '-')}`;
  return (
    <Box as="section" aria-labelledby={id} bg="bg.panel" borderWidth="1px" borderColor="border" borderRadius="l3" p={{ base: '5', md: '7' }} shadow="xs">
      <Stack gap="5">
        <Stack gap="1">
          <Heading as="h2" id={id} textStyle="2xl">
            {title}
          </Heading>
          {description ? <Text color="fg.muted">{description}</Text> : null}
        </Stack>
        {children}
      </Stack>
    </Box>
  );
}

/** The admin's editor for the local protocol: the whole settings, validated by the shared schema. */
export function ProtocolForm({ document }: { document: ProtocolDocument }) {
  const form = useForm<ProtocolSettings>({
    // The schema fills defaults for settings older versions lacked; the form always holds them all.
    resolver: zodResolver(protocolSettingsSchema, { error: friendlyError }) as Resolver<ProtocolSettings>,
    defaultValues: document.protocol,
    mode: 'onTouched',
  });
  const [notice, setNotice] = useState<string | null>(null);
  const [confirmReset, setConfirmReset] = useState(false);
  // Keys saved before are fixed; only a drug added now may get a new key.
  const savedKeys = useMemo(() => new Set(document.protocol.drugs.map((d) => d.key)), [document.protocol.drugs]);

  const afterSave = (message: string) => (doc: ProtocolDocument) => {
    form.reset(doc.protocol);
    setNotice(`${message} ${lastChanged(doc)}`);
  };
  const save = useSaveProtocol({ onSuccess: afterSave('Saved.') });
  const reset = useResetProtocol({
    onSuccess: (doc) => {
      setConfirmReset(false);
      afterSave('The published defaults are back in force.')(doc);
    },
  });

  const onSubmit = form.handleSubmit(
    (values) => {
      setNotice(null);
      save.mutate(tidy(values), {
        onError: (error) => {
          // The server names the field; put its words beside the input too.
          const issues = isApiError(error) && error.body && typeof error.body === 'object' ? (error.body as { issues?: unknown }).issues : undefined;
          if (Array.isArray(issues)) {
            for (const issue of issues as { path?: string; message?: string }[]) {
              if (issue.path && issue.message) form.setError(issue.path as FieldPath<ProtocolSettings>, { message: issue.message });
            }
          }
        },
      });
    },
    () => setNotice(null),
  );

  const errorCount = Object.keys(form.formState.errors).length;

  return (
    <FormProvider {...form}>
      <form
        noValidate
        aria-label="Protocol settings"
        onSubmit={(event) => {
          void onSubmit(event);
        }}
      >
        <Stack gap="6" pb="4">
          <Alert.Root status="warning" variant="outline" borderWidth="2px" borderRadius="l3" alignItems="flex-start" data-testid="protocol-caution">
            <Alert.Indicator boxSize="7" />
            <Alert.Content>
              <Alert.Title textStyle="xl" fontWeight="bold">
                Read before changing anything
              </Alert.Title>
              <Alert.Description textStyle="lg">{PROTOCOL_CAUTION}</Alert.Description>
            </Alert.Content>
          </Alert.Root>

          <Text data-testid="protocol-last-changed" fontWeight="bold">
            {lastChanged(document)}
          </Text>

          <Section title="Guideline edition" description="Shown beside every reminder and dose, so the team knows what the numbers follow.">
            <TextField name="edition" label="Edition these values follow" />
          </Section>

          <Section title="Timers and reminders">
            <SimpleGrid columns={{ base: 1, md: 2 }} gap="5">
              <SecondsField name="cprCycleSeconds" label="Compression cycle" help="Time between rhythm checks." />
              <SecondsField name="pauseWarningSeconds" label="Pause warning" help="A pause in compressions longer than this is flagged." />
              <SecondsField name="epinephrineWindowSeconds.min" label="Epinephrine due from" help="After the last dose." />
              <SecondsField name="epinephrineWindowSeconds.max" label="Epinephrine overdue after" help="After the last dose." />
              <SecondsField name="sustainedRoscSeconds" label="Sustained ROSC after" help="ROSC lasting this long counts as sustained." />
            </SimpleGrid>
          </Section>

          <Section
            title="Defibrillation energies"
            description="Biphasic energies depend on the device: the manufacturer's recommended energy comes first. These are presets on the pad, not settings of the defibrillator."
          >
            <SimpleGrid columns={{ base: 1, md: 3 }} gap="5">
              <NumberListField name="shockPresetsJoules" label="Shock presets" unit="J" help="Up to 8 energies, separated by commas." />
              <NumberField name="defaultShockJoules" label="Default energy" unit="J" help="Must be one of the presets." />
              <NumberField name="adultMaxJoules" label="Adult maximum energy" unit="J" help="Pediatric escalation stops here." />
            </SimpleGrid>
          </Section>

          <Section title="Pediatric energies" description="Per kilogram of the child's weight; double-check every weight-based value.">
            <SimpleGrid columns={{ base: 1, md: 3 }} gap="5">
              <NumberField name="pediatricEnergy.firstJoulesPerKg" label="First shock" unit="J/kg" />
              <NumberField name="pediatricEnergy.secondJoulesPerKg" label="Second shock" unit="J/kg" />
              <NumberField name="pediatricEnergy.maxJoulesPerKg" label="Largest shock" unit="J/kg" />
              <NumberField name="pediatricEnergy.cardioversionFirstJoulesPerKg" label="Synchronised cardioversion, first (low)" unit="J/kg" />
              <NumberField name="pediatricEnergy.cardioversionFirstJoulesPerKgHigh" label="Synchronised cardioversion, first (high)" unit="J/kg" />
              <NumberField name="pediatricEnergy.cardioversionNextJoulesPerKg" label="Synchronised cardioversion, next" unit="J/kg" />
            </SimpleGrid>
          </Section>

          <Section
            title="Drug catalogue"
            description="The drugs on the pad with their default doses. Check each concentration and unit against the code-cart tray and your formulary."
          >
            <DrugCatalogue savedKeys={savedKeys} />
          </Section>
        </Stack>

        <Box
          position="sticky"
          bottom="0"
          zIndex="sticky"
          bg="bg.panel"
          borderTopWidth="3px"
          borderTopColor="brand.solid"
          shadow="lg"
          px={{ base: '4', md: '6' }}
          py="4"
          mx={{ base: '-4', md: '0' }}
          borderRadius={{ md: 'l3' }}
        >
          <Stack gap="3">
            {save.isError ? <ErrorMessage title="Not saved" message={save.error.message} /> : null}
            {reset.isError ? <ErrorMessage title="Defaults not restored" message={reset.error.message} /> : null}
            {errorCount > 0 ? (
              <Text role="alert" color="overdue.fg" fontWeight="bold">
                ⚠ Some values need attention; each is marked beside its field.
              </Text>
            ) : null}
            <Text role="status" aria-live="polite" fontWeight="bold" color="brand.fg" data-testid="protocol-notice">
              {notice ? `✓ ${notice}` : ''}
            </Text>
            <Flex gap="4" wrap="wrap" justify="space-between">
              <Button type="submit" colorPalette="brand" size="xl" loading={save.isPending} loadingText="Saving…" minW="14rem">
                Save protocol
              </Button>
              <Button variant="outline" colorPalette="ink" size="lg" onClick={() => setConfirmReset(true)}>
                Reset to published defaults…
              </Button>
            </Flex>
          </Stack>
        </Box>
      </form>

      <Dialog.Root open={confirmReset} onOpenChange={(details) => setConfirmReset(details.open)} role="alertdialog" placement="center">
        <Portal>
          <Dialog.Backdrop />
          <Dialog.Positioner>
            <Dialog.Content>
              <Dialog.Header>
                <Dialog.Title textStyle="2xl">Reset to the published defaults?</Dialog.Title>
              </Dialog.Header>
              <Dialog.Body textStyle="lg">
                <Stack gap="3">
                  <Text>Every local change (timers, energies, the drug catalogue) is replaced by the published defaults, for every screen.</Text>
                  <Text fontWeight="bold">Check the defaults against your institution&apos;s protocol afterwards.</Text>
                </Stack>
              </Dialog.Body>
              <Dialog.Footer gap="3">
                <Dialog.ActionTrigger asChild>
                  <Button variant="outline" size="lg">
                    Keep my settings
                  </Button>
                </Dialog.ActionTrigger>
                <Button colorPalette="red" size="lg" loading={reset.isPending} loadingText="Restoring…" onClick={() => reset.mutate()}>
                  Reset to defaults
                </Button>
              </Dialog.Footer>
            </Dialog.Content>
          </Dialog.Positioner>
        </Portal>
      </Dialog.Root>
    </FormProvider>
  );
}

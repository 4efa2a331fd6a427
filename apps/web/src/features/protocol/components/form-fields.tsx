import { Field, Input, Textarea } from '@chakra-ui/react';
import type { ProtocolSettings } from '@steadyhand/shared';
import { useState, type ReactNode } from 'react';
import { get, useController, useFormContext, useFormState, useWatch, type FieldPath } from 'react-hook-form';
import { z } from 'zod';

export type SettingsPath = FieldPath<ProtocolSettings>;

/** Plain words for the schema's checks; the schema's own messages (cross-field checks) win. */
export const friendlyError: z.core.$ZodErrorMap = (issue) => {
  if (issue.code === 'invalid_type') {
    if (issue.expected === 'int') return 'Enter a whole number';
    if (issue.expected === 'number') return 'Enter a number';
    if (issue.expected === 'string') return 'Required';
    return undefined;
  }
  if (issue.code === 'too_small') {
    const min = String(issue.minimum);
    if (issue.origin === 'string') return 'Required';
    if (issue.origin === 'array') return `Enter at least ${min} value${min === '1' ? '' : 's'}`;
    return issue.inclusive === false ? `Must be more than ${min}` : `Must be at least ${min}`;
  }
  if (issue.code === 'too_big') {
    const max = String(issue.maximum);
    if (issue.origin === 'string') return `At most ${max} characters`;
    if (issue.origin === 'array') return `At most ${max} values`;
    return `Must be at most ${max}`;
  }
  return undefined;
};

/** The first message in an error node, including per-item errors of a list. */
export function errorText(node: unknown): string | undefined {
  if (!node || typeof node !== 'object') return undefined;
  const withMessage = node as { message?: unknown; root?: { message?: unknown } };
  if (typeof withMessage.message === 'string') return withMessage.message;
  if (typeof withMessage.root?.message === 'string') return withMessage.root.message;
  if (Array.isArray(node)) {
    const index = node.findIndex((item) => errorText(item) !== undefined);
    if (index >= 0) return `Value ${String(index + 1)}: ${errorText(node[index]) ?? ''}`;
  }
  return undefined;
}

function useFieldError(name: SettingsPath): string | undefined {
  const { errors } = useFormState<ProtocolSettings>({ name });
  return errorText(get(errors, name));
}

/** "150" -> "2:30", to read a number of seconds at a glance. */
export function minutesAndSeconds(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '–';
  const whole = Math.round(seconds);
  return `${String(Math.floor(whole / 60))}:${String(whole % 60).padStart(2, '0')}`;
}

const toNumber = (v: unknown) => (v === '' || v === null || v === undefined ? Number.NaN : Number(v));
const toOptionalNumber = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v));

interface NumberFieldProps {
  name: SettingsPath;
  label: string;
  /** Unit shown after the label, e.g. "s" or "J". */
  unit?: string;
  help?: ReactNode;
  optional?: boolean;
}

/** A number typed as text (decimal keypad on tablets), so a typo is reported rather than dropped. */
export function NumberField({ name, label, unit, help, optional = false }: NumberFieldProps) {
  const { register } = useFormContext<ProtocolSettings>();
  const error = useFieldError(name);
  return (
    <Field.Root invalid={error !== undefined} required={!optional}>
      <Field.Label>
        {label}
        {unit ? ` (${unit})` : ''}
        {optional ? ' (optional)' : ''}
      </Field.Label>
      <Input
        {...register(name, { setValueAs: optional ? toOptionalNumber : toNumber })}
        inputMode="decimal"
        autoComplete="off"
        bg="bg.panel"
      />
      {help ? <Field.HelperText>{help}</Field.HelperText> : null}
      <Field.ErrorText>{error}</Field.ErrorText>
    </Field.Root>
  );
}

/** Seconds, with the same time shown as m:ss beneath as the admin types. */
export function SecondsField({ name, label, help }: { name: SettingsPath; label: string; help?: string }) {
  const value: unknown = useWatch<ProtocolSettings>({ name });
  const seconds = typeof value === 'number' ? value : Number.NaN;
  return (
    <NumberField
      name={name}
      label={label}
      unit="seconds"
      help={
        <>
          <span data-testid={`mmss-${name}`}>= {minutesAndSeconds(seconds)} (m:ss)</span>
          {help ? ` · ${help}` : ''}
        </>
      }
    />
  );
}

export function TextField({ name, label, help, multiline = false, readOnly = false }: { name: SettingsPath; label: string; help?: string; multiline?: boolean; readOnly?: boolean }) {
  const { register } = useFormContext<ProtocolSettings>();
  const error = useFieldError(name);
  const Control = multiline ? Textarea : Input;
  return (
    <Field.Root invalid={error !== undefined} required readOnly={readOnly}>
      <Field.Label>{label}</Field.Label>
      <Control {...register(name)} autoComplete="off" bg={readOnly ? 'bg.muted' : 'bg.panel'} />
      {help ? <Field.HelperText>{help}</Field.HelperText> : null}
      <Field.ErrorText>{error}</Field.ErrorText>
    </Field.Root>
  );
}

const parseList = (text: string): number[] =>
  text
    .split(/[\s,;]+/)
    .filter((part) => part !== '')
    .map(Number);
const sameList = (a: readonly number[], b: readonly number[]) => a.length === b.length && a.every((x, i) => Object.is(x, b[i]));

const NO_NUMBERS: readonly number[] = [];

/** An ordered list of numbers typed as "300, 150": order matters (dose 1, dose 2, then the last repeats). */
export function NumberListField({ name, label, unit, help }: { name: SettingsPath; label: string; unit?: string; help?: string }) {
  const {
    field: { ref, name: fieldName, value: rawValue, onChange, onBlur },
  } = useController<ProtocolSettings>({ name });
  const value = Array.isArray(rawValue) ? (rawValue as number[]) : NO_NUMBERS;
  const [draft, setDraft] = useState(() => ({ text: value.join(', '), of: value }));
  const error = useFieldError(name);

  // Follow the form when its value changes from outside (a save or a reset to defaults), but keep
  // the admin's own spacing while the typed text still means the same list.
  if (draft.of !== value) {
    setDraft({ text: sameList(parseList(draft.text), value) ? draft.text : value.join(', '), of: value });
  }

  return (
    <Field.Root invalid={error !== undefined} required>
      <Field.Label>
        {label}
        {unit ? ` (${unit})` : ''}
      </Field.Label>
      <Input
        ref={ref}
        name={fieldName}
        value={draft.text}
        onBlur={onBlur}
        onChange={(event) => {
          const list = parseList(event.target.value);
          setDraft({ text: event.target.value, of: list });
          onChange(list);
        }}
        inputMode="decimal"
        autoComplete="off"
        bg="bg.panel"
      />
      <Field.HelperText>{help ?? 'Separate the values with commas.'}</Field.HelperText>
      <Field.ErrorText>{error}</Field.ErrorText>
    </Field.Root>
  );
}

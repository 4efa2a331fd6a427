import { Box, Button, SimpleGrid, Stack, Text, Textarea } from '@chakra-ui/react';
import { DOSE_UNITS, DRUG_ROUTES, doseUnitLabel, type DoseUnit } from '@steadyhand/shared';
import { useState, type ReactNode } from 'react';
import { ROUTE_WORDS } from '../../../lib/live/entry-words';
import { EditorPanel } from './editor-panel';
import { NumberPad, parsePadNumber } from './number-pad';

/* The dose, number and note editors: opened on purpose, so loaded on first use (the pad's first load stays small). */

type Route = (typeof DRUG_ROUTES)[number];

function Choice<T extends string>({
  options,
  value,
  onChange,
  label,
  words,
}: {
  options: readonly T[];
  value: T;
  onChange: (v: T) => void;
  label: string;
  words: (v: T) => string;
}) {
  return (
    <Box role="radiogroup" aria-label={label}>
      <Text textStyle="sm" fontWeight="bold" mb="1">
        {label}
      </Text>
      <SimpleGrid columns={options.length > 4 ? 3 : options.length} gap="2">
        {options.map((o) => (
          <Button
            key={o}
            role="radio"
            aria-checked={o === value}
            minH="16"
            variant={o === value ? 'solid' : 'outline'}
            colorPalette="ink"
            bg={o === value ? undefined : 'white'}
            borderWidth="2px"
            data-testid={`choice-${o}`}
            onClick={() => onChange(o)}
          >
            {words(o)}
          </Button>
        ))}
      </SimpleGrid>
    </Box>
  );
}

export function DoseEditor({
  title,
  initialDose,
  initialRoute,
  unit: fixedUnit,
  chooseUnit = false,
  saveLabel,
  onSave,
  onCancel,
  note,
}: {
  title: string;
  initialDose: number | null;
  initialRoute: Route;
  unit: DoseUnit;
  chooseUnit?: boolean;
  saveLabel: string;
  onSave: (dose: number, route: Route, unit: DoseUnit) => void;
  onCancel: () => void;
  note?: ReactNode;
}) {
  const [value, setValue] = useState(initialDose === null ? '' : String(initialDose));
  const [route, setRoute] = useState<Route>(initialRoute);
  const [unit, setUnit] = useState<DoseUnit>(fixedUnit);
  const dose = parsePadNumber(value);
  return (
    <EditorPanel title={title} onCancel={onCancel} testId="dose-editor">
      <Stack gap="3">
        {note}
        <NumberPad value={value} onChange={setValue} unit={doseUnitLabel(unit)} label="Dose" />
        {chooseUnit ? (
          <Choice
            options={DOSE_UNITS}
            value={unit}
            onChange={setUnit}
            label="Unit"
            words={doseUnitLabel}
          />
        ) : null}
        <Choice
          options={DRUG_ROUTES}
          value={route}
          onChange={setRoute}
          label="Route"
          words={(r) => ROUTE_WORDS[r]}
        />
        <Button
          minH="20"
          colorPalette="brand"
          textStyle="xl"
          disabled={dose === null}
          data-testid="dose-save"
          onClick={() => dose !== null && onSave(dose, route, unit)}
        >
          {saveLabel}
        </Button>
      </Stack>
    </EditorPanel>
  );
}

export function NumberEditor({
  title,
  unit,
  min,
  max,
  allowDecimal = false,
  saveLabel,
  initial = null,
  onSave,
  onCancel,
  note,
}: {
  title: string;
  unit: string;
  min: number;
  max: number;
  allowDecimal?: boolean;
  saveLabel: string;
  initial?: number | null;
  onSave: (value: number) => void;
  onCancel: () => void;
  note?: ReactNode;
}) {
  const [value, setValue] = useState(initial === null ? '' : String(initial));
  const n = parsePadNumber(value);
  const inRange = n !== null && n >= min && n <= max;
  return (
    <EditorPanel title={title} onCancel={onCancel} testId="number-editor">
      <Stack gap="3">
        {note}
        <NumberPad
          value={value}
          onChange={setValue}
          unit={unit}
          label={title}
          allowDecimal={allowDecimal}
        />
        {n !== null && !inRange ? (
          <Text role="alert" fontWeight="bold" color="alarm.700">
            Between {min} and {max} {unit}.
          </Text>
        ) : null}
        <Button
          minH="20"
          colorPalette="brand"
          textStyle="xl"
          disabled={!inRange}
          data-testid="number-save"
          onClick={() => n !== null && inRange && onSave(n)}
        >
          {saveLabel}
        </Button>
      </Stack>
    </EditorPanel>
  );
}

export const QUICK_NOTES = [
  'Family present',
  'Defibrillator pads on',
  'Mechanical CPR device on',
  'Reversible causes reviewed',
  'Handed over to receiving team',
  'Difficult airway',
] as const;

/** The one place a typing keyboard may appear; the quick notes need none. */
export function NoteEditor({
  onSave,
  onCancel,
}: {
  onSave: (text: string) => void;
  onCancel: () => void;
}) {
  const [text, setText] = useState('');
  return (
    <EditorPanel title="Note" onCancel={onCancel} testId="note-editor">
      <Stack gap="3">
        <SimpleGrid columns={2} gap="2">
          {QUICK_NOTES.map((n) => (
            <Button
              key={n}
              minH="16"
              h="auto"
              whiteSpace="normal"
              variant="outline"
              bg="white"
              colorPalette="ink"
              borderWidth="2px"
              onClick={() => onSave(n)}
            >
              {n}
            </Button>
          ))}
        </SimpleGrid>
        <Box>
          <Text asChild textStyle="sm" fontWeight="bold">
            <label htmlFor="note-text">Or write a note</label>
          </Text>
          <Textarea
            id="note-text"
            value={text}
            maxLength={2000}
            rows={3}
            textStyle="lg"
            onChange={(e) => setText(e.target.value)}
          />
        </Box>
        <Button
          minH="20"
          colorPalette="brand"
          textStyle="xl"
          disabled={text.trim() === ''}
          data-testid="note-save"
          onClick={() => onSave(text.trim())}
        >
          Record note
        </Button>
      </Stack>
    </EditorPanel>
  );
}

import { Box, Button, Flex, Input, SimpleGrid, Stack, Text } from '@chakra-ui/react';
import type { Code } from '@steadyhand/shared';
import dayjs from 'dayjs';
import { useState } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { useUpdateCode } from '../api/update-code';
import { EditorPanel } from './editor-panel';

const EARLIER_MINUTES = [1, 2, 5] as const;

/**
 * When the arrest was recognised. It starts as the moment Start was tapped; if recording began
 * late, the recorder or leader sets it earlier, and every interval and target follows. Audited
 * on the server with the old and new time.
 */
export function ArrestTime({ code, canWrite, onSaved }: { code: Code; canWrite: boolean; onSaved: (code: Code) => void }) {
  const [open, setOpen] = useState(false);
  const [clock, setClock] = useState('');
  const update = useUpdateCode(code.id, {
    onSuccess: (next) => {
      onSaved(next);
      setOpen(false);
    },
  });
  const startedMs = Date.parse(code.createdAt);
  const set = (ms: number) => update.mutate({ arrestAt: new Date(ms).toISOString() });
  const moved = code.arrestAt !== code.createdAt;
  return (
    <>
      <Button
        variant="outline"
        size="sm"
        minH="12"
        disabled={!canWrite}
        onClick={() => setOpen(true)}
        data-testid="arrest-time"
        aria-description="Change when the arrest was recognised"
      >
        Arrest {dayjs(code.arrestAt).format('HH:mm:ss')}
        {moved ? ' (set earlier)' : ''} · change
      </Button>
      {open ? (
        <EditorPanel title="When was the arrest recognised?" onCancel={() => setOpen(false)} testId="arrest-time-editor">
          <Stack gap="3">
            <Text>
              If recording began late, set when the arrest was really recognised. Every interval and target follows it; the
              change is kept in the audit trail.
            </Text>
            <SimpleGrid columns={2} gap="2">
              <Button minH="16" variant="outline" onClick={() => set(startedMs)} loading={update.isPending} data-testid="arrest-at-start">
                When Start was tapped ({dayjs(startedMs).format('HH:mm:ss')})
              </Button>
              {EARLIER_MINUTES.map((m) => (
                <Button key={m} minH="16" variant="outline" onClick={() => set(startedMs - m * 60_000)} loading={update.isPending} data-testid={`arrest-earlier-${m}`}>
                  {m} min before Start ({dayjs(startedMs - m * 60_000).format('HH:mm:ss')})
                </Button>
              ))}
            </SimpleGrid>
            <Box>
              <Text fontWeight="bold" id="arrest-clock-label">
                Or a clock time today
              </Text>
              <Flex gap="2" mt="1">
                <Input id="arrest-clock" aria-labelledby="arrest-clock-label" type="time" step="1" value={clock} onChange={(e) => setClock(e.target.value)} minH="12" />
                <Button
                  minH="12"
                  colorPalette="brand"
                  disabled={!/^\d{2}:\d{2}(:\d{2})?$/.test(clock)}
                  onClick={() => {
                    const [h = 0, m = 0, s = 0] = clock.split(':').map(Number);
                    // The time today; a time later than Start was tapped is taken as yesterday's (a code across midnight).
                    let at = dayjs(startedMs).hour(h).minute(m).second(s).millisecond(0);
                    if (at.valueOf() > startedMs) at = at.subtract(1, 'day');
                    set(at.valueOf());
                  }}
                >
                  Set
                </Button>
              </Flex>
            </Box>
            {update.isError ? <ErrorMessage title="Not changed" message={update.error.message} /> : null}
          </Stack>
        </EditorPanel>
      ) : null}
    </>
  );
}

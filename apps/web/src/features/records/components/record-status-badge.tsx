import { Badge } from '@chakra-ui/react';
import type { RecordStatus } from '@steadyhand/shared';

const STATUS: Record<RecordStatus, { words: string; mark: string; palette: string }> = {
  draft: { words: 'Not signed', mark: '○', palette: 'orange' },
  'partly-signed': { words: 'One signature of two', mark: '◐', palette: 'yellow' },
  signed: { words: 'Signed', mark: '●', palette: 'green' },
};

/** Where a record stands, in a word and a mark (never by colour alone). */
export function RecordStatusBadge({ status }: { status: RecordStatus }) {
  const s = STATUS[status];
  return (
    <Badge
      colorPalette={s.palette}
      variant="subtle"
      size="lg"
      data-testid="record-status"
      data-status={status}
    >
      <span aria-hidden="true">{s.mark}</span> {s.words}
    </Badge>
  );
}

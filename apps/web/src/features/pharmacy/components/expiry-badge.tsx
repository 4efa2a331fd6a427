import { Badge } from '@chakra-ui/react';
import { expiryNote } from '@steadyhand/shared';

/** Today as the server counts it (UTC), so the page and the restock list flag the same items. */
export const todayUtc = (): string => new Date().toISOString().slice(0, 10);

/** Shape + words + colour, as for discrepancies: expired is a problem, expiring soon a warning. */
export function ExpiryBadge({ expiry, testId }: { expiry: string | null; testId?: string }) {
  const note = expiryNote(expiry, todayUtc());
  if (!note) return null;
  return note === 'expired' ? (
    <Badge colorPalette="red" variant="solid" data-testid={testId}>
      ▲ Expired
    </Badge>
  ) : (
    <Badge colorPalette="orange" variant="subtle" data-testid={testId}>
      ● Expires within 30 days
    </Badge>
  );
}

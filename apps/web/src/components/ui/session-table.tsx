import { Badge, Button, Table, Text } from '@chakra-ui/react';
import type { SessionInfo } from '@steadyhand/shared';
import dayjs from 'dayjs';

/** "Chrome on Android" from a user-agent string: enough to tell a ward tablet from a desk computer. */
export function describeDevice(userAgent: string | null): string {
  if (!userAgent) return 'Unknown device';
  const browser = /Edg\//.test(userAgent)
    ? 'Edge'
    : /Firefox\//.test(userAgent)
      ? 'Firefox'
      : /Chrom(e|ium)\//.test(userAgent)
        ? 'Chrome'
        : /Safari\//.test(userAgent)
          ? 'Safari'
          : null;
  const system = /Android/.test(userAgent)
    ? 'Android'
    : /iPad|iPhone/.test(userAgent)
      ? 'iPad or iPhone'
      : /Windows/.test(userAgent)
        ? 'Windows'
        : /Mac OS X/.test(userAgent)
          ? 'Mac'
          : /Linux/.test(userAgent)
            ? 'Linux'
            : null;
  if (!browser && !system) return userAgent.slice(0, 60);
  return [browser ?? 'A browser', system ? `on ${system}` : ''].join(' ').trim();
}

interface SessionTableProps {
  sessions: SessionInfo[];
  showPerson: boolean;
  onEnd: (session: SessionInfo) => void;
  /** The session being ended, to show its button as busy. */
  ending: string | null;
}

/** Signed-in sessions with who, which device, when last seen, and a way to end each. */
export function SessionTable({ sessions, showPerson, onEnd, ending }: SessionTableProps) {
  if (sessions.length === 0) return <Text color="fg.muted">No one is signed in.</Text>;
  return (
    <Table.ScrollArea borderWidth="1px" borderRadius="l2" tabIndex={0} role="region" aria-label="Sessions, scrolls sideways">
      <Table.Root size="md" data-testid="session-table">
        <Table.Header>
          <Table.Row>
            {showPerson ? <Table.ColumnHeader>Person</Table.ColumnHeader> : null}
            <Table.ColumnHeader>Device</Table.ColumnHeader>
            <Table.ColumnHeader>Signed in</Table.ColumnHeader>
            <Table.ColumnHeader>Last seen</Table.ColumnHeader>
            <Table.ColumnHeader textAlign="end">
              <Text srOnly>Actions</Text>
            </Table.ColumnHeader>
          </Table.Row>
        </Table.Header>
        <Table.Body>
          {sessions.map((s) => (
            <Table.Row key={s.id}>
              {showPerson ? (
                <Table.Cell>
                  {s.displayName}{' '}
                  <Text as="span" color="fg.muted">
                    ({s.username})
                  </Text>
                </Table.Cell>
              ) : null}
              <Table.Cell>
                {describeDevice(s.userAgent)}{' '}
                {s.current ? (
                  <Badge colorPalette="brand" variant="subtle">
                    This device
                  </Badge>
                ) : null}
              </Table.Cell>
              <Table.Cell>{dayjs(s.createdAt).format('D MMM HH:mm')}</Table.Cell>
              <Table.Cell>{dayjs(s.lastSeenAt).format('D MMM HH:mm')}</Table.Cell>
              <Table.Cell textAlign="end">
                <Button
                  size="sm"
                  variant="outline"
                  colorPalette="red"
                  loading={ending === s.id}
                  // The visible words start the name (WCAG 2.5.3); whose and which device follow.
                  aria-label={`${s.current ? 'Sign out here' : 'End session'}: ${s.displayName} on ${describeDevice(s.userAgent)}`}
                  onClick={() => onEnd(s)}
                >
                  {s.current ? 'Sign out here' : 'End session'}
                </Button>
              </Table.Cell>
            </Table.Row>
          ))}
        </Table.Body>
      </Table.Root>
    </Table.ScrollArea>
  );
}

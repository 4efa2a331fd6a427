import { Badge, Box, Button, Code, Heading, HStack, Stack, Text, Wrap } from '@chakra-ui/react';
import { ROLE_LABELS, ROLES, type Role } from '@steadyhand/shared';
import { useDemo } from '../api/get-demo';

function roleLabel(role: string): string {
  return (ROLES as readonly string[]).includes(role) ? ROLE_LABELS[role as Role] : role;
}

/** Shown only when the server runs in demo mode: invented people to sign in as. */
export function DemoAccounts({ onPick }: { onPick: (username: string) => void }) {
  const { data } = useDemo();
  if (!data?.enabled) return null;
  const accounts = data.accounts ?? [];

  return (
    <Box
      as="section"
      aria-labelledby="demo-heading"
      data-testid="demo-panel"
      borderWidth="2px"
      borderStyle="dashed"
      borderColor="due.border"
      bg="due.subtle"
      borderRadius="l3"
      p="5"
    >
      <Stack gap="4">
        <HStack gap="3" wrap="wrap">
          <Badge colorPalette="due" variant="solid" size="lg">
            Demo
          </Badge>
          <Heading as="h2" id="demo-heading" textStyle="xl">
            Demonstration accounts
          </Heading>
        </HStack>
        <Text>These invented people exist only on this demonstration server. Never use it for a real patient.</Text>
        {data.password ? (
          <Text>
            Password for every account:{' '}
            <Code textStyle="lg" px="2" py="1" data-testid="demo-password">
              {data.password}
            </Code>
          </Text>
        ) : null}
        {accounts.length > 0 ? (
          <Stack as="ul" gap="3" listStyleType="none" m="0" p="0" aria-label="Demonstration accounts">
            {accounts.map((account) => (
              <li key={account.username}>
                <Button
                  variant="outline"
                  bg="bg.panel"
                  w="full"
                  h="auto"
                  py="3"
                  justifyContent="flex-start"
                  textAlign="start"
                  whiteSpace="normal"
                  onClick={() => {
                    onPick(account.username);
                  }}
                >
                  <Stack gap="1" align="flex-start">
                    <Text as="span" fontWeight="bold">
                      {account.displayName}{' '}
                      <Text as="span" fontWeight="normal" color="fg.muted">
                        {account.username}
                      </Text>
                    </Text>
                    <Wrap as="span" gap="2">
                      {account.roles.map((role) => (
                        <Badge key={role} colorPalette="ink" variant="subtle" size="md">
                          {roleLabel(role)}
                        </Badge>
                      ))}
                    </Wrap>
                  </Stack>
                </Button>
              </li>
            ))}
          </Stack>
        ) : null}
        <Text textStyle="md" color="fg.muted">
          Tap a person to fill in the username.
        </Text>
      </Stack>
    </Box>
  );
}

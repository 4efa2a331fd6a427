import { Heading, Stack, Text } from '@chakra-ui/react';
import { PageTitle } from '../../../components/ui/page-title';
import { VerifyRecord } from '../../../features/records/components/verify-record';

export function Component() {
  return (
    <Stack gap="6">
      <PageTitle title="Check a printed record" />
      <Stack gap="1">
        <Heading as="h1" textStyle={{ base: '3xl', md: '4xl' }} data-testid="verify-heading">
          Check a printed record
        </Heading>
        <Text color="fg.muted" maxW="50rem">
          A code record PDF carries the SHA-256 of the record on every page and the server’s
          signature. Check a file, or the digest from a paper copy, to know whether it is the record
          as kept now.
        </Text>
      </Stack>
      <VerifyRecord />
    </Stack>
  );
}

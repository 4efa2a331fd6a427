import { Button, Heading, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink, useParams } from 'react-router';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';

/** Placeholder for the recorder pad; the page's own work is built separately. */
export function Component() {
  const { codeId = '' } = useParams();
  return (
    <Stack gap="6">
      <PageTitle title="Record a code" />
      <Heading as="h1" textStyle="3xl" data-testid="record-heading">
        Code <span data-testid="record-code-id">{codeId}</span>
      </Heading>
      <Text>The recorder pad for this code will appear here.</Text>
      <div>
        <Button asChild variant="outline">
          <RouterLink to={paths.home.getHref()}>Back to home</RouterLink>
        </Button>
      </div>
    </Stack>
  );
}

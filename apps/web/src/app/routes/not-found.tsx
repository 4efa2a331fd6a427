import { Button, Heading, Stack, Text } from '@chakra-ui/react';
import { Link as RouterLink } from 'react-router';
import { PageTitle } from '../../components/ui/page-title';
import { paths } from '../../config/paths';

export function Component() {
  return (
    <Stack as="main" id="main" gap="6" maxW="40rem" mx="auto" py="16" px="6">
      <PageTitle title="Page not found" />
      <Heading as="h1" textStyle="3xl">
        Page not found
      </Heading>
      <Text>There is no page at this address.</Text>
      <div>
        <Button asChild colorPalette="brand">
          <RouterLink to={paths.home.getHref()}>Go to home</RouterLink>
        </Button>
      </div>
    </Stack>
  );
}

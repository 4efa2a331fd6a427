import { Text } from '@chakra-ui/react';
import { isRouteErrorResponse, useRouteError } from 'react-router';
import { PageProblem } from '../../components/ui/page-status';
import { PageTitle } from '../../components/ui/page-title';

/** Last line of defence for a page that failed to load or render. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  const notFound = isRouteErrorResponse(error) && error.status === 404;
  return (
    <>
      <PageTitle title={notFound ? 'Page not found' : 'Something went wrong'} />
      <PageProblem
        title={notFound ? 'Page not found' : 'Something went wrong'}
        actionLabel="Reload the page"
        onAction={() => {
          window.location.reload();
        }}
      >
        <Text>
          {notFound
            ? 'There is no page at this address.'
            : 'This page could not be shown. Reloading usually fixes it; nothing already saved is lost.'}
        </Text>
      </PageProblem>
    </>
  );
}

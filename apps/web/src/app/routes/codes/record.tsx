import { Button, Text } from '@chakra-ui/react';
import { hasAnyRole, ROLE_LABELS, WRITER_ROLES } from '@steadyhand/shared';
import { useNavigate, useParams } from 'react-router';
import { PageProblem, PageSpinner } from '../../../components/ui/page-status';
import { PageTitle } from '../../../components/ui/page-title';
import { paths } from '../../../config/paths';
import { useCurrentUser } from '../../../lib/session/use-current-user';
import { RecorderPad } from '../../../features/recorder/components/recorder-pad';
import { isApiError } from '../../../lib/api-client';
import { useLiveCode } from '../../../lib/live/use-live-code';

/** The recorder pad for one code; the same page is the second screen for anyone watching. */
export function Component() {
  const { codeId = '' } = useParams();
  const user = useCurrentUser();
  const navigate = useNavigate();
  const live = useLiveCode(codeId);
  const canWrite = hasAnyRole(user.roles, WRITER_ROLES);

  if (live.code && live.protocol) {
    const roles = user.roles.map((r) => ROLE_LABELS[r]).join(', ') || 'no role';
    return (
      <>
        <PageTitle title="Recorder pad" />
        <RecorderPad
          live={live}
          code={live.code}
          protocol={live.protocol}
          canWrite={canWrite}
          readOnlyReason={
            canWrite
              ? undefined
              : `You are signed in as ${roles}: only a recorder or a team leader can add entries.`
          }
        />
      </>
    );
  }

  if (live.codeError) {
    const notFound = isApiError(live.codeError) && live.codeError.status === 404;
    return (
      <>
        <PageTitle title="Recorder pad" />
        <PageProblem
          title={notFound ? 'No such code' : 'This code cannot be shown yet'}
          actionLabel="Back to home"
          onAction={() => void navigate(paths.home.getHref())}
        >
          <Text>
            {notFound
              ? 'There is no code at this address.'
              : 'The server cannot be reached and this tablet has not opened this code before. Taps already on this tablet are kept.'}
          </Text>
          {!notFound ? (
            <Button variant="outline" onClick={() => window.location.reload()}>
              Try again
            </Button>
          ) : null}
        </PageProblem>
      </>
    );
  }

  return <PageSpinner label="Opening the code…" />;
}

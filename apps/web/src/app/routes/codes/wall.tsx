import { useParams } from 'react-router';
import { PageTitle } from '../../../components/ui/page-title';
import { WallScreen } from '../../../features/wall/components/wall-screen';

/** The timer wall for one code; any signed-in role may watch. */
export function Component() {
  const { codeId = '' } = useParams();
  return (
    <>
      <PageTitle title="Timer wall" />
      <WallScreen key={codeId} codeId={codeId} />
    </>
  );
}

import { PageTitle } from '../../components/ui/page-title';
import { WallBoard } from '../../features/wall/components/wall-board';

/** Every live code on one screen, each card opening its wall. */
export function Component() {
  return (
    <>
      <PageTitle title="Live codes board" />
      <WallBoard />
    </>
  );
}

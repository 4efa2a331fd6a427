import { ErrorMessage } from '../../../components/ui/error-message';
import { PageSpinner } from '../../../components/ui/page-status';
import { useProtocol } from '../api/get-protocol';
import { ProtocolForm } from './protocol-form';

/** Loads the settings in force, then hands them to the form. */
export function ProtocolSettingsEditor() {
  const query = useProtocol();
  if (query.isPending) return <PageSpinner label="Loading the protocol settings…" />;
  if (query.isError) return <ErrorMessage title="The protocol settings could not be loaded" message={query.error.message} />;
  return <ProtocolForm document={query.data} />;
}

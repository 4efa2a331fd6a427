import type { ProtocolDocument, ProtocolSettings } from '@steadyhand/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { protocolDocumentSchema, protocolKeys } from './get-protocol';

export async function saveProtocol(settings: ProtocolSettings): Promise<ProtocolDocument> {
  return protocolDocumentSchema.parse(await api.put('/api/protocol', settings));
}

export async function resetProtocol(): Promise<ProtocolDocument> {
  return protocolDocumentSchema.parse(await api.post('/api/protocol/reset'));
}

function useProtocolMutation<T>(mutationFn: (input: T) => Promise<ProtocolDocument>, onSuccess?: (doc: ProtocolDocument) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (doc) => {
      // The server's answer is the settings now in force; no second fetch needed.
      queryClient.setQueryData(protocolKeys.document, doc);
      onSuccess?.(doc);
    },
  });
}

export function useSaveProtocol({ onSuccess }: { onSuccess?: (doc: ProtocolDocument) => void } = {}) {
  return useProtocolMutation(saveProtocol, onSuccess);
}

export function useResetProtocol({ onSuccess }: { onSuccess?: (doc: ProtocolDocument) => void } = {}) {
  return useProtocolMutation<void>(() => resetProtocol(), onSuccess);
}

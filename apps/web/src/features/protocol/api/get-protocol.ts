import { protocolSettingsSchema, type ProtocolDocument, textSchema } from '@steadyhand/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

// Checked on arrival: the admin form is filled from this, so a malformed answer must not reach it.
export const protocolDocumentSchema = z.object({
  protocol: protocolSettingsSchema,
  updatedAt: textSchema().nullable(),
  updatedBy: textSchema().nullable(),
});

export const protocolQueryKey = ['protocol'] as const;

export async function getProtocol(): Promise<ProtocolDocument> {
  return protocolDocumentSchema.parse(await api.get('/api/protocol'));
}

export const protocolQueryOptions = () => queryOptions({ queryKey: protocolQueryKey, queryFn: getProtocol });

export function useProtocol() {
  return useQuery(protocolQueryOptions());
}

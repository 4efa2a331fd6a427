import {
  DEFAULT_PROTOCOL,
  protocolSettingsSchema,
  textSchema,
  type ProtocolDocument,
  type ProtocolSettings,
} from '@steadyhand/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api, isApiError } from './api-client';
import { readCachedProtocol, writeCachedProtocol } from './live/outbox';

/**
 * The one owner of the protocol in the browser. Two shapes, two keys, never mixed: the document
 * in force (the admin page, the start of a code) and one numbered version's settings (a code's
 * pad, wall and review use the version the code started with).
 */

export const protocolKeys = {
  all: ['protocol'] as const,
  document: ['protocol', 'document'] as const,
  version: (version: number) => ['protocol', 'version', version] as const,
};

// Checked on arrival: screens and the admin form are filled from this.
export const protocolDocumentSchema = z.object({
  protocol: protocolSettingsSchema,
  version: z.number().int().positive(),
  updatedAt: textSchema().nullable(),
  updatedBy: textSchema().nullable(),
});

const protocolVersionSchema = z.object({ version: z.number().int().positive(), protocol: protocolSettingsSchema });

const isNetworkFailure = (err: unknown) => !isApiError(err);

export async function getProtocolDocument(): Promise<ProtocolDocument> {
  const doc = protocolDocumentSchema.parse(await api.get('/api/protocol'));
  void writeCachedProtocol(doc.version, doc.protocol).catch(() => undefined);
  return doc;
}

/** One version's settings; offline, the copy this device kept of it (or, failing that, of any version). */
async function getProtocolVersion(version: number): Promise<ProtocolSettings> {
  try {
    const body = protocolVersionSchema.parse(await api.get(`/api/protocol/versions/${version}`));
    void writeCachedProtocol(version, body.protocol).catch(() => undefined);
    return body.protocol;
  } catch (err) {
    if (!isNetworkFailure(err)) throw err;
    return (await readCachedProtocol(version).catch(() => null)) ?? (await readCachedProtocol(null).catch(() => null)) ?? DEFAULT_PROTOCOL;
  }
}

export const protocolDocumentQueryOptions = () =>
  queryOptions({ queryKey: protocolKeys.document, queryFn: getProtocolDocument });

/** A version never changes once saved: fetched once per tab. */
export const protocolVersionQueryOptions = (version: number) =>
  queryOptions({ queryKey: protocolKeys.version(version), queryFn: () => getProtocolVersion(version), staleTime: Infinity });

export function useProtocolDocument() {
  return useQuery(protocolDocumentQueryOptions());
}

/** The settings of the version a code started with (codes from before versions use version 1). */
export function useCodeProtocol(version: number | null | undefined) {
  return useQuery({ ...protocolVersionQueryOptions(version ?? 1), enabled: version !== undefined });
}

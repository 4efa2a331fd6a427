import type {
  CodeAttachment,
  CodeSummary,
  NewEntry,
  RecordListItem,
  RecordSignature,
  RecordStatus,
  RecordView,
  ReviewDetailsRequest,
  SignatureMeaning,
  VerifyRecordResult,
} from '@steadyhand/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

// The server builds these answers from the shared types; the screens only read them.
export const recordKeys = {
  all: ['records'] as const,
  list: ['records', 'list'] as const,
  record: (codeId: string) => ['records', 'record', codeId] as const,
  summary: (codeId: string) => ['records', 'summary', codeId] as const,
  attachments: (codeId: string) => ['records', 'attachments', codeId] as const,
};

const codePath = (codeId: string) => `/api/codes/${encodeURIComponent(codeId)}`;

export const recordPdfHref = (codeId: string) => `${codePath(codeId)}/record.pdf`;
export const attachmentContentHref = (attachmentId: string) =>
  `/api/attachments/${encodeURIComponent(attachmentId)}/content`;

export const recordsListQueryOptions = () =>
  queryOptions({
    queryKey: recordKeys.list,
    queryFn: async () => ((await api.get('/api/records')) as { records: RecordListItem[] }).records,
    staleTime: 10_000,
  });

export function useRecordsList() {
  return useQuery(recordsListQueryOptions());
}

export function useRecordView(codeId: string) {
  return useQuery({
    queryKey: recordKeys.record(codeId),
    queryFn: async ({ signal }) =>
      (await api.get(`${codePath(codeId)}/record`, { signal })) as RecordView,
  });
}

export function useCodeSummary(codeId: string) {
  return useQuery({
    queryKey: recordKeys.summary(codeId),
    queryFn: async ({ signal }) =>
      (await api.get(`${codePath(codeId)}/summary`, { signal })) as CodeSummary,
  });
}

export function useAttachments(codeId: string) {
  return useQuery({
    queryKey: recordKeys.attachments(codeId),
    queryFn: async ({ signal }) =>
      (
        (await api.get(`${codePath(codeId)}/attachments`, { signal })) as {
          attachments: CodeAttachment[];
        }
      ).attachments,
  });
}

/** Every change to a record changes its digest, summary and list status: read them all again. */
function useRecordMutation<T, R>(codeId: string, send: (input: T) => Promise<R>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSettled: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: recordKeys.record(codeId) }),
        queryClient.invalidateQueries({ queryKey: recordKeys.summary(codeId) }),
        queryClient.invalidateQueries({ queryKey: recordKeys.attachments(codeId) }),
        queryClient.invalidateQueries({ queryKey: recordKeys.list }),
      ]);
    },
  });
}

export function useSaveReviewDetails(codeId: string) {
  return useRecordMutation(codeId, (body: ReviewDetailsRequest) =>
    api.patch(`${codePath(codeId)}/review`, body),
  );
}

/**
 * A correction (void, amend) or a note. Before the first signature it joins the log as a plain
 * entry; after it, the server takes only addenda, marked as added later.
 */
export function useAddRecordEntry(codeId: string, status: RecordStatus | undefined) {
  return useRecordMutation(codeId, (entry: NewEntry) =>
    api.post(`${codePath(codeId)}/${status === 'draft' ? 'entries' : 'addenda'}`, entry),
  );
}

export function useSignRecord(codeId: string) {
  return useRecordMutation(
    codeId,
    async (body: { meaning: SignatureMeaning; password: string }) =>
      (await api.post(`${codePath(codeId)}/signatures`, body)) as {
        signature: RecordSignature;
        status: RecordStatus;
      },
  );
}

export function useUploadAttachment(codeId: string) {
  return useRecordMutation(codeId, async (file: File) => {
    const form = new FormData();
    form.append('file', file, file.name);
    return (
      (await api.post(`${codePath(codeId)}/attachments`, form)) as { attachment: CodeAttachment }
    ).attachment;
  });
}

/** Verification: a PDF file, or a digest typed or pasted from a printout. */
export function useVerifyRecord() {
  return useMutation({
    mutationFn: async (input: { file: File } | { digest: string; recordId?: string }) => {
      if ('file' in input) {
        const form = new FormData();
        form.append('file', input.file, input.file.name);
        return (await api.post('/api/records/verify', form)) as VerifyRecordResult;
      }
      return (await api.post('/api/records/verify', input)) as VerifyRecordResult;
    },
  });
}

import { codeSchema, type Code, type UpdateCodeRequest } from '@steadyhand/shared';
import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

const responseSchema = z.object({ code: codeSchema });

/** PATCH /api/codes/:id: details completed during the code (category, weight, location). */
export async function updateCode(codeId: string, changes: UpdateCodeRequest): Promise<Code> {
  return responseSchema.parse(await api.patch(`/api/codes/${encodeURIComponent(codeId)}`, changes))
    .code;
}

export function useUpdateCode(
  codeId: string,
  { onSuccess }: { onSuccess?: (code: Code) => void } = {},
) {
  return useMutation({
    mutationFn: (changes: UpdateCodeRequest) => updateCode(codeId, changes),
    onSuccess,
  });
}

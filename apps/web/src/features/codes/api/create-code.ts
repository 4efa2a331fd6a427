import type { CreateCodeRequest } from '@steadyhand/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

const createCodeResponseSchema = z.object({ code: z.looseObject({ id: z.string() }) });

export type CreatedCode = z.infer<typeof createCodeResponseSchema>['code'];

export async function createCode(input: CreateCodeRequest): Promise<CreatedCode> {
  return createCodeResponseSchema.parse(await api.post('/api/codes', input)).code;
}

export function useCreateCode({ onSuccess }: { onSuccess?: (code: CreatedCode) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createCode,
    onSuccess: (code) => {
      void queryClient.invalidateQueries({ queryKey: ['codes', 'list'] });
      onSuccess?.(code);
    },
  });
}

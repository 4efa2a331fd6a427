import { textSchema, type CreateCodeRequest } from '@steadyhand/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useRef } from 'react';
import { z } from 'zod';
import { api, isApiError } from '../../../lib/api-client';

const createCodeResponseSchema = z.object({ code: z.looseObject({ id: textSchema() }) });

export type CreatedCode = z.infer<typeof createCodeResponseSchema>['code'];

export async function createCode(input: CreateCodeRequest): Promise<CreatedCode> {
  return createCodeResponseSchema.parse(await api.post('/api/codes', input)).code;
}

export function useCreateCode({ onSuccess }: { onSuccess?: (code: CreatedCode) => void } = {}) {
  const queryClient = useQueryClient();
  // One id per start, made on the device and kept until the server has answered: a retry (or a
  // second tap after a lost answer) returns the same code instead of opening another.
  const startId = useRef<string | null>(null);
  return useMutation({
    mutationFn: (input: CreateCodeRequest) => {
      startId.current ??= crypto.randomUUID();
      return createCode({ ...input, id: startId.current });
    },
    retry: (count, error) => !isApiError(error) && count < 3,
    onSuccess: (code) => {
      startId.current = null;
      void queryClient.invalidateQueries({ queryKey: ['codes', 'list'] });
      onSuccess?.(code);
    },
  });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import { textSchema } from '@steadyhand/shared';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

const demoAccountSchema = z.object({
  username: textSchema(),
  displayName: textSchema(),
  // Plain strings, so a role this build does not know yet cannot hide the whole panel.
  roles: z.array(textSchema()),
});

const demoInfoSchema = z.object({
  enabled: z.boolean(),
  password: textSchema().optional(),
  accounts: z.array(demoAccountSchema).optional(),
});

export type DemoAccount = z.infer<typeof demoAccountSchema>;
export type DemoInfo = z.infer<typeof demoInfoSchema>;

export async function getDemo(): Promise<DemoInfo> {
  return demoInfoSchema.parse(await api.get('/api/auth/demo'));
}

export const demoQueryOptions = () =>
  queryOptions({
    queryKey: ['auth', 'demo'] as const,
    queryFn: getDemo,
    staleTime: Infinity,
    // The panel is a convenience; if the server cannot say, the sign-in page simply shows none.
    retry: false,
  });

export function useDemo() {
  return useQuery(demoQueryOptions());
}

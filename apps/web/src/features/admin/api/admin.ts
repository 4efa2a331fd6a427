import type { AdminUser, AuditPage, BackupList, CreateUserRequest, Places, Role, SessionInfo } from '@steadyhand/shared';
import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

// Answers follow the shared contract types; they are not re-validated here.
const usersKey = ['admin', 'users'] as const;
const placesKey = ['admin', 'places'] as const;
const sessionsKey = ['admin', 'sessions'] as const;

export function useAdminUsers() {
  return useQuery({ queryKey: usersKey, queryFn: async () => ((await api.get('/api/admin/users')) as { users: AdminUser[] }).users });
}

/** Every change to a person answers with the person; the list is fetched again. */
function useUserMutation<T>(call: (input: T) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (input: T) => ((await call(input)) as { user: AdminUser }).user,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersKey }),
  });
}

const userPath = (id: string, rest = '') => `/api/admin/users/${encodeURIComponent(id)}${rest}`;

export const useCreateUser = () => useUserMutation((body: CreateUserRequest) => api.post('/api/admin/users', body));
export const useRenameUser = () => useUserMutation(({ id, displayName }: { id: string; displayName: string }) => api.patch(userPath(id), { displayName }));
export const useSetRoles = () => useUserMutation(({ id, roles }: { id: string; roles: Role[] }) => api.put(userPath(id, '/roles'), { roles }));
export const useResetPassword = () => useUserMutation(({ id, password }: { id: string; password: string }) => api.post(userPath(id, '/password'), { password }));
export const useSetDisabled = () => useUserMutation(({ id, disabled }: { id: string; disabled: boolean }) => api.post(userPath(id, disabled ? '/disable' : '/enable')));
export const useResetSecondFactor = () => useUserMutation((id: string) => api.post(userPath(id, '/second-factor/reset')));

export function useAdminPlaces() {
  return useQuery({ queryKey: placesKey, queryFn: async () => (await api.get('/api/admin/places')) as Places });
}

/** Every places change answers with all places, which replaces the cached copy. */
export function usePlacesChange() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (change: { method: 'post' | 'put' | 'patch' | 'delete'; path: string; body?: object }) =>
      (change.method === 'delete' ? await api.delete(change.path) : await api[change.method](change.path, change.body)) as Places,
    onSuccess: (places) => queryClient.setQueryData(placesKey, places),
  });
}

export function useAllSessions() {
  return useQuery({ queryKey: sessionsKey, queryFn: async () => ((await api.get('/api/admin/sessions')) as { sessions: SessionInfo[] }).sessions, refetchInterval: 30_000 });
}

export function useEndSession() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/api/admin/sessions/${encodeURIComponent(id)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: sessionsKey }),
  });
}

export type AuditFilters = { person?: string; codeId?: string; from?: string; to?: string; action?: string };

export function auditQueryString(filters: AuditFilters, page?: number): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(filters)) if (value) params.set(key, value);
  if (page && page > 1) params.set('page', String(page));
  const text = params.toString();
  return text ? `?${text}` : '';
}

export function useAudit(filters: AuditFilters, page: number) {
  return useQuery({
    queryKey: ['admin', 'audit', filters, page],
    queryFn: async () => (await api.get(`/api/admin/audit${auditQueryString(filters, page)}`)) as AuditPage,
    placeholderData: keepPreviousData,
  });
}

/** One message caught by the development mail relay (envelope addresses). */
export interface OutboxMessage {
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

export function useOutbox() {
  return useQuery({
    queryKey: ['admin', 'outbox'],
    queryFn: async () => ((await api.get('/api/dev/outbox')) as { messages: OutboxMessage[] }).messages,
    // 404 means this server sends real mail; asking again will not change that.
    retry: false,
    refetchInterval: 10_000,
  });
}

/** The database copies in BACKUP_DIR with their checks, newest first. */
export function useBackups() {
  return useQuery({ queryKey: ['admin', 'backups'], queryFn: async () => (await api.get('/api/admin/backups')) as BackupList, refetchInterval: 60_000 });
}

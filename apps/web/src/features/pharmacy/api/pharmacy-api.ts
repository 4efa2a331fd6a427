import type {
  CartRestock,
  PharmacyUnit,
  ReconciliationAddendumRequest,
  ReconciliationView,
  SaveReconciliationRequest,
  TrayTemplate,
  TrayTemplateInput,
  WorklistItem,
} from '@steadyhand/shared';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

// The server builds these answers from the shared types; the page only reads them.
export const pharmacyKeys = {
  worklist: ['pharmacy', 'worklist'] as const,
  trays: ['pharmacy', 'trays'] as const,
  reconciliation: (codeId: string) => ['pharmacy', 'reconciliation', codeId] as const,
  cartRestock: (unitId: string, since: string) => ['pharmacy', 'cart-restock', unitId, since] as const,
};

export const restockHref = (codeId: string, format: 'csv' | 'pdf') =>
  `/api/codes/${encodeURIComponent(codeId)}/reconciliation/restock.${format}`;

/** The cart's restock list; `since` blank leaves the server's default (7 days back). */
export function cartRestockHref(unitId: string, since: string, format?: 'csv' | 'pdf') {
  const query = since ? `?since=${encodeURIComponent(since)}` : '';
  return `/api/pharmacy/carts/${encodeURIComponent(unitId)}/restock${format ? `.${format}` : ''}${query}`;
}

export function useCartRestock(unitId: string, since: string) {
  return useQuery({
    queryKey: pharmacyKeys.cartRestock(unitId, since),
    queryFn: async () => (await api.get(cartRestockHref(unitId, since))) as CartRestock,
    enabled: unitId !== '',
    retry: false,
  });
}

export const worklistQueryOptions = () =>
  queryOptions({
    queryKey: pharmacyKeys.worklist,
    queryFn: async () => ((await api.get('/api/pharmacy/worklist')) as { codes: WorklistItem[] }).codes,
    refetchInterval: 30_000,
  });

export function useWorklist() {
  return useQuery(worklistQueryOptions());
}

export function useReconciliation(codeId: string) {
  return useQuery({
    queryKey: pharmacyKeys.reconciliation(codeId),
    queryFn: async () => (await api.get(`/api/codes/${encodeURIComponent(codeId)}/reconciliation`)) as ReconciliationView,
  });
}

function useReconciliationMutation<T>(codeId: string, send: (body: T) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: T) => (await send(body)) as ReconciliationView,
    onSuccess: (view) => {
      queryClient.setQueryData(pharmacyKeys.reconciliation(codeId), view);
      void queryClient.invalidateQueries({ queryKey: pharmacyKeys.worklist });
    },
  });
}

export function useSaveReconciliation(codeId: string) {
  return useReconciliationMutation<SaveReconciliationRequest>(codeId, (body) => api.put(`/api/codes/${encodeURIComponent(codeId)}/reconciliation`, body));
}

export function useSignReconciliation(codeId: string) {
  return useReconciliationMutation<{ password: string }>(codeId, (body) => api.post(`/api/codes/${encodeURIComponent(codeId)}/reconciliation/sign`, body));
}

export function useAddReconciliationAddendum(codeId: string) {
  return useReconciliationMutation<ReconciliationAddendumRequest>(codeId, (body) =>
    api.post(`/api/codes/${encodeURIComponent(codeId)}/reconciliation/addenda`, body),
  );
}

export function useTrays() {
  return useQuery({
    queryKey: pharmacyKeys.trays,
    queryFn: async () => (await api.get('/api/pharmacy/trays')) as { trays: TrayTemplate[]; units: PharmacyUnit[] },
  });
}

export function useSaveTray() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async ({ id, body }: { id: string | null; body: TrayTemplateInput }) =>
      id ? api.put(`/api/pharmacy/trays/${encodeURIComponent(id)}`, body) : api.post('/api/pharmacy/trays', body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: pharmacyKeys.trays }),
  });
}

export function useAssignTray() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ unitId, trayId }: { unitId: string; trayId: string | null }) =>
      api.put(`/api/pharmacy/units/${encodeURIComponent(unitId)}/tray`, { trayId }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: pharmacyKeys.trays }),
  });
}

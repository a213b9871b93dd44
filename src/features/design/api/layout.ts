import { type LayoutBody, type PlantingBody, plantingResponse } from '@common/contracts/design';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { invalidateTrial } from '@/lib/trial-keys';

const generated = z.object({ seed: z.number().int(), plots: z.number().int() });
const url = (slug: string) => `/api/trials/${encodeURIComponent(slug)}/layout`;

export const generateLayout = (slug: string, body: LayoutBody) =>
  api(url(slug), generated, { method: 'POST', body });
export const clearLayout = (slug: string) => api<void>(url(slug), null, { method: 'DELETE' });
export const recordPlanting = (slug: string, body: PlantingBody) =>
  api(`${url(slug)}/planting`, plantingResponse, { method: 'PUT', body });

export function useGenerateLayout(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: LayoutBody) => generateLayout(slug, body),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

export function useClearLayout(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => clearLayout(slug),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

export function useRecordPlanting(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: PlantingBody) => recordPlanting(slug, body),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

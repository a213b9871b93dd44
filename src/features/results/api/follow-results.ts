import { useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';

const accepted = z.object({ message: z.string() });
const followed = z.object({ title: z.string(), slug: z.string(), email: z.string() });

export const followResults = (slug: string, email: string) =>
  api(`/api/results/${encodeURIComponent(slug)}/followers`, accepted, {
    method: 'POST',
    body: { email },
  });

export const useFollowResults = (slug: string) =>
  useMutation({ mutationFn: (email: string) => followResults(slug, email) });

export const confirmFollow = (token: string) =>
  api('/api/results/followers/confirm', followed, { method: 'POST', body: { token } });

export const unsubscribe = (token: string) =>
  api('/api/results/unsubscribe', followed, { method: 'POST', query: { token } });

'use client';

import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useCallback } from 'react';
import { apiFetch } from '@/lib/api/client';
import type { StudyMemberDto } from '@/lib/api/dto';
import type { SuggestionDto, ThreadDto } from '@/lib/api/review';

/**
 * Live review data. New comments and suggestions appear by polling the API every 10 seconds
 * while the page is visible (TanStack Query pauses the interval in a hidden tab and refetches when
 * the window regains focus). Polling rather than server-sent events: the answers are the same
 * checked API routes as everything else, it needs no open connection per viewer on a small
 * server, and it works unchanged when several app servers share one database (an event stream
 * would need them to tell each other). Review is not a chat: a few seconds' delay is fine.
 */
export const REVIEW_POLL_MS = 10_000;

const live = { refetchInterval: REVIEW_POLL_MS, refetchIntervalInBackground: false, refetchOnWindowFocus: true } as const;

export function useThreads(studyId: string, query = '') {
  return useQuery({
    queryKey: ['threads', studyId, query],
    queryFn: () => apiFetch<{ items: ThreadDto[] }>(`/api/v1/studies/${studyId}/threads${query}`),
    ...live,
  });
}

export function useSuggestions(studyId: string) {
  return useQuery({
    queryKey: ['suggestions', studyId],
    queryFn: () => apiFetch<{ items: SuggestionDto[] }>(`/api/v1/studies/${studyId}/suggestions`),
    ...live,
  });
}

export function useMembers(studyId: string) {
  return useQuery({
    queryKey: ['members', studyId],
    queryFn: () => apiFetch<{ items: StudyMemberDto[] }>(`/api/v1/studies/${studyId}/members`),
    staleTime: 60_000,
  });
}

/** After a write: every view of this study's threads and suggestions fetches again, and the server parts (the tab's count) render again. */
export function useRefreshReview(studyId: string) {
  const client = useQueryClient();
  const router = useRouter();
  return useCallback(async () => {
    await Promise.all([client.invalidateQueries({ queryKey: ['threads', studyId] }), client.invalidateQueries({ queryKey: ['suggestions', studyId] })]);
    router.refresh();
  }, [client, router, studyId]);
}

export function reviewHref(studyId: string, params: Record<string, string>): string {
  const q = new URLSearchParams(params).toString();
  return `/studies/${studyId}/review${q ? `?${q}` : ''}`;
}

'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { apiFetch } from '@/lib/api/client';

interface Invitation {
  id: string;
  email: string;
  workspaceRole: string;
  studyRole: string | null;
  state: 'pending' | 'accepted' | 'revoked' | 'expired';
  expiresAt: string;
  invitedBy: string | null;
}

export function InvitationsList({ endpoint, queryKey }: { endpoint: string; queryKey: unknown[] }) {
  const queryClient = useQueryClient();
  const list = useQuery({ queryKey, queryFn: () => apiFetch<{ items: Invitation[] }>(endpoint) });
  const revoke = useMutation({
    mutationFn: (id: string) => apiFetch(`/api/v1/invitations/${id}`, { method: 'DELETE' }),
    onSettled: () => queryClient.invalidateQueries({ queryKey }),
  });
  const items = list.data?.items ?? [];
  return (
    <div className="space-y-2">
      <div aria-live="polite">{(revoke.error ?? list.error) && <Alert tone="error">{((revoke.error ?? list.error) as Error).message}</Alert>}</div>
      {items.length === 0 ? (
        <p className="text-sm text-muted">{list.isLoading ? 'Loading invitations…' : 'No invitations yet.'}</p>
      ) : (
        <ul className="divide-y divide-line rounded-lg border border-line bg-white">
          {items.map((i) => (
            <li key={i.id} className="flex flex-wrap items-center gap-3 px-4 py-2 text-sm">
              <span className="min-w-0 flex-1 truncate font-semibold">{i.email}</span>
              <span className="capitalize">{i.studyRole ?? i.workspaceRole}</span>
              <Badge tone={i.state === 'pending' ? 'caution' : i.state === 'accepted' ? 'ok' : 'neutral'}>{i.state}</Badge>
              {i.state === 'pending' && (
                <>
                  <span className="text-muted">
                    until <time dateTime={i.expiresAt}>{new Date(i.expiresAt).toLocaleDateString('en-GB')}</time>
                  </span>
                  <button
                    type="button"
                    onClick={() => revoke.mutate(i.id)}
                    className="rounded-md px-2 py-1 font-semibold text-danger hover:bg-danger-light"
                  >
                    Revoke<span className="sr-only"> invitation for {i.email}</span>
                  </button>
                </>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

'use client';

import { formatDate } from '@/lib/format';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { apiFetch } from '@/lib/api/client';
import type { InvitationDto as Invitation } from '@/lib/api/dto';

/** While an e-mail is on its way, the list asks again this often. */
const REFRESH_WHILE_SENDING_MS = 3_000;

const DELIVERY_WORDS: Record<NonNullable<Invitation['delivery']>, { text: string; className: string }> = {
  sending: { text: 'E-mail sending…', className: 'text-muted' },
  sent: { text: 'E-mail sent', className: 'text-ok' },
  retrying: { text: 'E-mail failed, retrying', className: 'text-caution' },
  failed: { text: 'E-mail not sent', className: 'font-semibold text-danger' },
};

function onItsWay(i: Invitation): boolean {
  return i.state === 'pending' && (i.delivery === 'sending' || i.delivery === 'retrying');
}

export function InvitationsList({ endpoint, queryKey }: { endpoint: string; queryKey: unknown[] }) {
  const queryClient = useQueryClient();
  const list = useQuery({
    queryKey,
    queryFn: () => apiFetch<{ items: Invitation[] }>(endpoint),
    refetchInterval: (query) => (query.state.data?.items.some(onItsWay) ? REFRESH_WHILE_SENDING_MS : false),
  });
  const revoke = useMutation({
    mutationFn: (id: string) => apiFetch(`/api/v1/invitations/${id}`, { method: 'DELETE' }),
    onSettled: () => queryClient.invalidateQueries({ queryKey }),
  });
  const resend = useMutation({
    mutationFn: (id: string) => apiFetch(`/api/v1/invitations/${id}/resend`, { method: 'POST' }),
    onSettled: () => queryClient.invalidateQueries({ queryKey }),
  });
  const items = list.data?.items ?? [];
  const error = revoke.error ?? resend.error ?? list.error;
  return (
    <div className="space-y-2">
      <div aria-live="polite">{error && <Alert tone="error">{(error as Error).message}</Alert>}</div>
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
                  {i.delivery && (
                    <span role="status" className={DELIVERY_WORDS[i.delivery].className}>
                      {DELIVERY_WORDS[i.delivery].text}
                    </span>
                  )}
                  <span className="text-muted">
                    until <time dateTime={i.expiresAt}>{formatDate(i.expiresAt)}</time>
                  </span>
                  {i.delivery === 'failed' && (
                    <button
                      type="button"
                      onClick={() => resend.mutate(i.id)}
                      disabled={resend.isPending}
                      className="rounded-md px-2 py-1 font-semibold text-brand-dark hover:bg-brand-light"
                    >
                      Send again<span className="sr-only"> the invitation for {i.email}</span>
                    </button>
                  )}
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

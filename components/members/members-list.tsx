'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { apiFetch } from '@/lib/api/client';
import type { MemberDto } from '@/lib/api/dto';

/**
 * Members with their roles. Those who may manage members get a role menu and a remove button;
 * everyone else sees the list only. Fixed roles (the study owner) are never editable.
 */
export function MembersList({
  endpoint,
  queryKey,
  canManage,
  roleOptions,
  fixedRoles = [],
  selfId,
}: {
  endpoint: string;
  queryKey: unknown[];
  canManage: boolean;
  roleOptions: { value: string; label: string }[];
  fixedRoles?: string[];
  selfId: string;
}) {
  const queryClient = useQueryClient();
  const members = useQuery({ queryKey, queryFn: () => apiFetch<{ items: MemberDto[] }>(endpoint) });
  const change = useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: string }) => apiFetch(`${endpoint}/${userId}`, { method: 'PATCH', json: { role } }),
    onSettled: () => queryClient.invalidateQueries({ queryKey }),
  });
  const remove = useMutation({
    mutationFn: (userId: string) => apiFetch(`${endpoint}/${userId}`, { method: 'DELETE' }),
    onSettled: () => queryClient.invalidateQueries({ queryKey }),
  });
  const error = change.error ?? remove.error ?? members.error;

  return (
    <div className="space-y-3">
      <div aria-live="polite">{error && <Alert tone="error">{(error as Error).message}</Alert>}</div>
      {members.isLoading && <p className="text-sm text-muted">Loading members…</p>}
      <ul className="divide-y divide-line rounded-lg border border-line bg-white">
        {members.data?.items.map((m) => {
          const editable = canManage && !fixedRoles.includes(m.role) && m.userId !== selfId;
          const label = m.name ?? m.email;
          return (
            <li key={m.userId} className="flex flex-wrap items-center gap-3 px-4 py-3">
              <div className="min-w-0 flex-1">
                <p className="font-semibold">
                  {label}
                  {m.userId === selfId && <span className="ml-1 text-xs font-normal text-muted">(you)</span>}
                </p>
                <p className="truncate text-sm text-muted">{m.email}</p>
              </div>
              {editable ? (
                <>
                  <label className="sr-only" htmlFor={`role-${m.userId}`}>
                    Role of {label}
                  </label>
                  <select
                    id={`role-${m.userId}`}
                    value={m.role}
                    onChange={(e) => change.mutate({ userId: m.userId, role: e.target.value })}
                    className="rounded-md border border-line bg-white px-2 py-1 text-sm"
                  >
                    {roleOptions.map((r) => (
                      <option key={r.value} value={r.value}>
                        {r.label}
                      </option>
                    ))}
                  </select>
                  <button
                    type="button"
                    onClick={() => {
                      if (window.confirm(`Remove ${label}?`)) remove.mutate(m.userId);
                    }}
                    className="rounded-md px-2 py-1 text-sm font-semibold text-danger hover:bg-danger-light"
                  >
                    Remove<span className="sr-only"> {label}</span>
                  </button>
                </>
              ) : (
                <span className="text-sm capitalize">{m.role}</span>
              )}
            </li>
          );
        })}
      </ul>
    </div>
  );
}

'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { SelectField, TextField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import { emailSchema } from '@/lib/validation/common';

const schema = z.object({ email: emailSchema, role: z.string().min(1, 'Choose a role.') });
type Values = z.infer<typeof schema>;

/** Invite by e-mail: to a workspace (admin/member) or to a study (a study role). */
export function InviteForm({
  endpoint,
  roles,
  defaultRole,
  queryKey,
}: {
  endpoint: string;
  roles: { value: string; label: string; description: string }[];
  defaultRole: string;
  queryKey: unknown[];
}) {
  const queryClient = useQueryClient();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { email: '', role: defaultRole } });
  const role = form.watch('role');
  const invite = useMutation({
    mutationFn: (v: Values) => apiFetch(endpoint, { method: 'POST', json: v }),
    onSuccess: async (_d, v) => {
      setSentTo(v.email);
      form.reset({ email: '', role: v.role });
      await queryClient.invalidateQueries({ queryKey });
    },
    onError: (err) => {
      setSentTo(null);
      if (err instanceof ApiError && err.fields?.email) form.setError('email', { message: err.fields.email[0] });
    },
  });
  return (
    <form onSubmit={form.handleSubmit((v) => invite.mutate(v))} noValidate aria-label="Invite someone" className="space-y-3">
      <div className="grid gap-3 sm:grid-cols-[1fr_12rem]">
        <TextField label="E-mail address" type="email" autoComplete="off" {...form.register('email')} error={form.formState.errors.email?.message} />
        <SelectField label="Role" {...form.register('role')} error={form.formState.errors.role?.message}>
          {roles.map((r) => (
            <option key={r.value} value={r.value}>
              {r.label}
            </option>
          ))}
        </SelectField>
      </div>
      <p className="text-sm text-muted">{roles.find((r) => r.value === role)?.description}</p>
      <div aria-live="polite">
        {sentTo && invite.isSuccess && <Alert live tone="success">
            Invited {sentTo}. The e-mail with the link is on its way; the list shows when it has gone. The link works once, for 7 days.
          </Alert>}
        {invite.isError && <Alert live tone="error">{(invite.error as Error).message}</Alert>}
      </div>
      <Button type="submit" disabled={invite.isPending}>
        {invite.isPending ? 'Sending…' : 'Send invitation'}
      </Button>
    </form>
  );
}

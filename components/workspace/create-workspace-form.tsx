'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/field';
import { apiFetch } from '@/lib/api/client';
import { workspaceCreateSchema, type WorkspaceCreateInput } from '@/lib/validation/workspace';

export function CreateWorkspaceForm() {
  const router = useRouter();
  const form = useForm<WorkspaceCreateInput>({ resolver: zodResolver(workspaceCreateSchema), defaultValues: { name: '' } });
  const create = useMutation({
    mutationFn: (v: WorkspaceCreateInput) => apiFetch<{ id: string }>('/api/v1/workspaces', { method: 'POST', json: v }),
    onSuccess: (ws) => {
      router.push(`/workspaces/${ws.id}`);
      router.refresh();
    },
  });
  return (
    <form onSubmit={form.handleSubmit((v) => create.mutate(v))} noValidate className="max-w-md space-y-4">
      <TextField label="Workspace name" help="Usually your team, lab or department." {...form.register('name')} error={form.formState.errors.name?.message} />
      <div aria-live="polite">{create.isError && <Alert tone="error">{(create.error as Error).message}</Alert>}</div>
      <Button type="submit" disabled={create.isPending}>
        Create workspace
      </Button>
    </form>
  );
}

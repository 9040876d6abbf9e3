'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextAreaField, TextField } from '@/components/ui/field';
import { apiFetch } from '@/lib/api/client';
import { studyCreateSchema } from '@/lib/validation/study';

const schema = studyCreateSchema.pick({ title: true, description: true });
type Values = z.input<typeof schema>;

/** Title and description, editable by those whose role allows it; archive and restore for the owner. */
export function StudyDetails({
  study,
  canEdit,
  canArchive,
}: {
  study: { id: string; title: string; description: string; status: string };
  canEdit: boolean;
  canArchive: boolean;
}) {
  const router = useRouter();
  const [editing, setEditing] = useState(false);
  const form = useForm<Values>({ resolver: zodResolver(schema), defaultValues: { title: study.title, description: study.description } });
  const save = useMutation({
    mutationFn: (v: Values) => apiFetch(`/api/v1/studies/${study.id}`, { method: 'PATCH', json: v }),
    onSuccess: () => {
      setEditing(false);
      router.refresh();
    },
  });
  const archived = study.status === 'archived';
  const archive = useMutation({
    mutationFn: () => apiFetch(`/api/v1/studies/${study.id}/${archived ? 'restore' : 'archive'}`, { method: 'POST' }),
    onSuccess: () => router.refresh(),
  });

  if (editing) {
    return (
      <form onSubmit={form.handleSubmit((v) => save.mutate(v))} noValidate className="space-y-4" aria-label="Edit study details">
        <TextField label="Title" {...form.register('title')} error={form.formState.errors.title?.message} />
        <TextAreaField label="Description" rows={4} {...form.register('description')} error={form.formState.errors.description?.message} />
        <div aria-live="polite">{save.isError && <Alert tone="error">{(save.error as Error).message}</Alert>}</div>
        <div className="flex gap-2">
          <Button type="submit" disabled={save.isPending}>
            Save
          </Button>
          <Button variant="secondary" onClick={() => setEditing(false)}>
            Cancel
          </Button>
        </div>
      </form>
    );
  }

  return (
    <div className="space-y-3">
      <p className="whitespace-pre-wrap text-sm">{study.description || <span className="text-muted">No description yet.</span>}</p>
      <div className="flex flex-wrap gap-2">
        {canEdit && !archived && (
          <Button variant="secondary" onClick={() => setEditing(true)}>
            Edit details
          </Button>
        )}
        {canArchive && (
          <Button variant={archived ? 'secondary' : 'danger'} onClick={() => archive.mutate()} disabled={archive.isPending}>
            {archived ? 'Restore study' : 'Archive study'}
          </Button>
        )}
      </div>
      <div aria-live="polite">{archive.isError && <Alert tone="error">{(archive.error as Error).message}</Alert>}</div>
      {!canEdit && <p className="text-sm text-muted">Your role can read this study but not edit it.</p>}
    </div>
  );
}

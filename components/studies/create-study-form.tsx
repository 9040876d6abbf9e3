'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextAreaField, TextField } from '@/components/ui/field';
import { apiFetch, ApiError } from '@/lib/api/client';
import type { StudyDto } from '@/lib/api/dto';
import { studyCreateSchema } from '@/lib/validation/study';

type Values = z.input<typeof studyCreateSchema>;

export function CreateStudyForm({ workspaceId }: { workspaceId: string }) {
  const [open, setOpen] = useState(false);
  const router = useRouter();
  const queryClient = useQueryClient();
  const form = useForm<Values>({ resolver: zodResolver(studyCreateSchema), defaultValues: { workspaceId, title: '', description: '' } });
  const create = useMutation({
    mutationFn: (values: Values) => apiFetch<StudyDto>('/api/v1/studies', { method: 'POST', json: values }),
    onSuccess: async (study) => {
      await queryClient.invalidateQueries({ queryKey: ['studies', workspaceId] });
      router.push(`/studies/${study.id}`);
    },
    onError: (err) => {
      if (err instanceof ApiError && err.fields) {
        for (const [k, v] of Object.entries(err.fields)) if (k === 'title' || k === 'description') form.setError(k, { message: v[0] });
      }
    },
  });

  if (!open) {
    return <Button onClick={() => setOpen(true)}>New study</Button>;
  }

  return (
    <form
      onSubmit={form.handleSubmit((v) => create.mutate(v))}
      noValidate
      aria-labelledby="new-study-heading"
      className="space-y-4 rounded-lg border border-line bg-white p-5"
    >
      <h2 id="new-study-heading" className="text-lg font-bold">
        New study
      </h2>
      <input type="hidden" {...form.register('workspaceId')} />
      <TextField label="Title" autoFocus {...form.register('title')} error={form.formState.errors.title?.message} />
      <TextAreaField
        label="Description"
        rows={3}
        help="Optional. The question, the population and the outcome, in a sentence or two."
        {...form.register('description')}
        error={form.formState.errors.description?.message}
      />
      <div aria-live="polite">{create.isError && <Alert tone="error">{(create.error as Error).message}</Alert>}</div>
      <div className="flex gap-2">
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? 'Creating…' : 'Create study'}
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

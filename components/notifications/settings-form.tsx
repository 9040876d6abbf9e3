'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { FormStatus } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { apiFetch } from '@/lib/api/client';
import { DELIVERIES, DELIVERY_WORDS, KIND_WORDS, NOTIFICATION_KINDS, type NotificationSettings } from '@/lib/notifications/kinds';
import { notificationSettingsSchema } from '@/lib/validation/notifications';

/** One group of three choices per kind of notification; saved together. */
export function NotificationSettingsForm({ initial }: { initial: NotificationSettings }) {
  const form = useForm<NotificationSettings>({ resolver: zodResolver(notificationSettingsSchema), defaultValues: initial });
  const save = useMutation({
    mutationFn: (v: NotificationSettings) => apiFetch<NotificationSettings>('/api/v1/me/notification-settings', { method: 'PUT', json: v }),
    onSuccess: (saved) => form.reset(saved),
  });
  const status = save.isError
    ? { status: 'error', message: (save.error as Error).message }
    : save.isSuccess && !form.formState.isDirty
      ? { status: 'success', message: 'Saved. New notifications follow these settings.' }
      : null;

  return (
    <form onSubmit={form.handleSubmit((v) => save.mutate(v))} noValidate className="space-y-4" aria-label="Notification settings">
      {NOTIFICATION_KINDS.map((kind) => {
        const error = form.formState.errors[kind]?.message;
        return (
          <fieldset key={kind} className="rounded-lg border border-line bg-white p-4" aria-describedby={`${kind}-about`}>
            <legend className="px-1 text-base font-bold">{KIND_WORDS[kind].label}</legend>
            <p id={`${kind}-about`} className="mb-3 text-sm text-muted">
              {KIND_WORDS[kind].description}
            </p>
            <div className="flex flex-wrap gap-x-6 gap-y-2">
              {DELIVERIES.map((d) => (
                <label key={d} className="flex items-start gap-2 text-sm">
                  <input type="radio" value={d} {...form.register(kind)} className="mt-1" />
                  <span>
                    <span className="font-semibold">{DELIVERY_WORDS[d].label}</span>
                    <span className="block text-muted">{DELIVERY_WORDS[d].description}</span>
                  </span>
                </label>
              ))}
            </div>
            {error && <p className="mt-2 text-sm font-medium text-danger">{error}</p>}
          </fieldset>
        );
      })}
      <FormStatus state={status} />
      <Button type="submit" disabled={save.isPending}>
        Save settings
      </Button>
    </form>
  );
}

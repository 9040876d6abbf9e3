'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { resetPasswordAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/alert';
import { TextField } from '@/components/ui/field';
import type { ActionState } from '@/lib/action-state';
import { PASSWORD_MIN, resetPasswordSchema, type ResetPasswordInput } from '@/lib/validation/auth';

export function ResetPasswordForm({ token }: { token: string }) {
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<ResetPasswordInput>({ resolver: zodResolver(resetPasswordSchema), defaultValues: { token, password: '', confirm: '' } });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    const result = await resetPasswordAction(values);
    if (result.status === 'error' && result.fields?.password) form.setError('password', { message: result.fields.password[0] });
    setState(result);
  });
  if (state?.status === 'success') {
    return (
      <div className="space-y-4">
        <FormStatus state={state} />
        <Link href="/sign-in" className="inline-block rounded-md bg-brand px-4 py-2 text-sm font-semibold text-white">
          Go to sign-in
        </Link>
      </div>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <input type="hidden" {...form.register('token')} />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        help={`At least ${PASSWORD_MIN} characters.`}
        {...form.register('password')}
        error={errors.password?.message}
      />
      <TextField label="New password again" type="password" autoComplete="new-password" {...form.register('confirm')} error={errors.confirm?.message} />
      <FormStatus state={state} />
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        Change password
      </Button>
    </form>
  );
}

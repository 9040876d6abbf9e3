'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { forgotPasswordAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/alert';
import { TextField } from '@/components/ui/field';
import type { ActionState } from '@/lib/action-state';
import { resetRequestSchema, type ResetRequestInput } from '@/lib/validation/auth';

export function ForgotPasswordForm() {
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<ResetRequestInput>({ resolver: zodResolver(resetRequestSchema), defaultValues: { email: '' } });
  const onSubmit = form.handleSubmit(async (values) => setState(await forgotPasswordAction(values)));
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <TextField label="E-mail" type="email" autoComplete="email" {...form.register('email')} error={form.formState.errors.email?.message} />
      <FormStatus state={state} />
      <Button type="submit" className="w-full" disabled={form.formState.isSubmitting}>
        Send reset link
      </Button>
    </form>
  );
}

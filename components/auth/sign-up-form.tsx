'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { signUpAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/alert';
import { TextField } from '@/components/ui/field';
import type { ActionState } from '@/lib/action-state';
import { PASSWORD_MIN, signUpSchema, type SignUpInput } from '@/lib/validation/auth';

export function SignUpForm({ callbackUrl }: { callbackUrl?: string }) {
  const [state, setState] = useState<ActionState | null>(null);
  const form = useForm<SignUpInput>({ resolver: zodResolver(signUpSchema), defaultValues: { name: '', email: '', password: '', callbackUrl } });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setState(null);
    const result = await signUpAction(values);
    if (result.status === 'error' && result.fields) {
      for (const [field, messages] of Object.entries(result.fields)) {
        if (field in values) form.setError(field as keyof SignUpInput, { message: messages[0] });
      }
    }
    setState(result);
    if (result.status === 'success') form.reset({ name: '', email: '', password: '', callbackUrl });
  });

  if (state?.status === 'success') return <FormStatus state={state} />;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <TextField label="Name" autoComplete="name" {...form.register('name')} error={errors.name?.message} />
      <TextField label="E-mail" type="email" autoComplete="email" {...form.register('email')} error={errors.email?.message} />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        help={`At least ${PASSWORD_MIN} characters, not one found in lists of breached passwords.`}
        {...form.register('password')}
        error={errors.password?.message}
      />
      <FormStatus state={state} />
      <Button type="submit" className="w-full" disabled={isSubmitting}>
        {isSubmitting ? 'Creating account…' : 'Create account'}
      </Button>
    </form>
  );
}

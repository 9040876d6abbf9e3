'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { magicLinkAction, signInAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/alert';
import { TextField } from '@/components/ui/field';
import type { ActionState } from '@/lib/action-state';
import { magicLinkSchema, signInSchema, type MagicLinkInput, type SignInInput } from '@/lib/validation/auth';

export function SignInForm({ callbackUrl }: { callbackUrl?: string }) {
  const [mode, setMode] = useState<'password' | 'link'>('password');
  const [state, setState] = useState<ActionState | null>(null);
  const password = useForm<SignInInput>({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '', callbackUrl } });
  const link = useForm<MagicLinkInput>({ resolver: zodResolver(magicLinkSchema), defaultValues: { email: '', callbackUrl } });

  const onPassword = password.handleSubmit(async (values) => {
    setState(null);
    const result = await signInAction(values);
    setState(result);
  });
  const onLink = link.handleSubmit(async (values) => {
    setState(null);
    const result = await magicLinkAction(values);
    setState(result);
  });

  return (
    <div className="space-y-5">
      <div role="group" aria-label="How to sign in" className="grid grid-cols-2 gap-1 rounded-md bg-slate-100 p-1">
        {(['password', 'link'] as const).map((m) => (
          <button
            key={m}
            type="button"
            aria-pressed={mode === m}
            onClick={() => {
              setMode(m);
              setState(null);
            }}
            className={`rounded px-3 py-1.5 text-sm font-semibold ${mode === m ? 'bg-white text-ink shadow-sm' : 'text-muted'}`}
          >
            {m === 'password' ? 'Password' : 'E-mail me a link'}
          </button>
        ))}
      </div>

      {mode === 'password' ? (
        <form onSubmit={onPassword} noValidate className="space-y-4">
          <TextField label="E-mail" type="email" autoComplete="email" {...password.register('email')} error={password.formState.errors.email?.message} />
          <TextField
            label="Password"
            type="password"
            autoComplete="current-password"
            {...password.register('password')}
            error={password.formState.errors.password?.message}
          />
          <FormStatus state={state} />
          <Button type="submit" className="w-full" disabled={password.formState.isSubmitting}>
            {password.formState.isSubmitting ? 'Signing in…' : 'Sign in'}
          </Button>
          <p className="text-sm">
            <Link href="/forgot-password" className="text-brand underline">
              Forgot your password?
            </Link>
          </p>
        </form>
      ) : (
        <form onSubmit={onLink} noValidate className="space-y-4">
          <TextField
            label="E-mail"
            type="email"
            autoComplete="email"
            help="We send a link that signs you in once, within 15 minutes."
            {...link.register('email')}
            error={link.formState.errors.email?.message}
          />
          <FormStatus state={state} />
          <Button type="submit" className="w-full" disabled={link.formState.isSubmitting}>
            {link.formState.isSubmitting ? 'Sending…' : 'Send sign-in link'}
          </Button>
        </form>
      )}
    </div>
  );
}

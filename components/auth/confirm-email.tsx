'use client';

import Link from 'next/link';
import { useState, useTransition } from 'react';
import { verifyEmailAction } from '@/app/(auth)/actions';
import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/alert';
import type { ActionState } from '@/lib/action-state';

/** A button rather than an automatic check, so that mail scanners that open links do not use up the token. */
export function ConfirmEmail({ token, callbackUrl }: { token: string; callbackUrl?: string }) {
  const [state, setState] = useState<ActionState | null>(null);
  const [pending, start] = useTransition();
  return (
    <div className="space-y-4">
      <FormStatus state={state} />
      {state?.status === 'success' ? (
        <Link href={`/sign-in${callbackUrl ? `?callbackUrl=${encodeURIComponent(callbackUrl)}` : ''}`} className="inline-block rounded-md bg-brand px-4 py-2 text-sm font-semibold text-white">
          Go to sign-in
        </Link>
      ) : (
        <Button disabled={pending} onClick={() => start(async () => setState(await verifyEmailAction(token)))}>
          {pending ? 'Confirming…' : 'Confirm my e-mail address'}
        </Button>
      )}
    </div>
  );
}

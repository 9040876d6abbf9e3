'use client';

import { useState, useTransition } from 'react';
import { acceptInvitationAction } from '@/app/invitations/actions';
import { Button } from '@/components/ui/button';
import { FormStatus } from '@/components/ui/alert';
import type { ActionState } from '@/lib/action-state';

export function AcceptInvitation({ token }: { token: string }) {
  const [state, setState] = useState<ActionState | null>(null);
  const [pending, start] = useTransition();
  return (
    <div className="space-y-3">
      <FormStatus state={state} />
      <Button disabled={pending} onClick={() => start(async () => setState(await acceptInvitationAction(token)))}>
        {pending ? 'Joining…' : 'Accept invitation'}
      </Button>
    </div>
  );
}

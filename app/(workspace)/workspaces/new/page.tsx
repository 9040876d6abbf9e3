import type { Metadata } from 'next';
import { CreateWorkspaceForm } from '@/components/workspace/create-workspace-form';

export const metadata: Metadata = { title: 'New workspace' };

export default function NewWorkspacePage() {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">New workspace</h1>
      <p className="text-sm text-muted">A workspace holds a team’s studies. You become its admin and can invite others.</p>
      <CreateWorkspaceForm />
    </div>
  );
}

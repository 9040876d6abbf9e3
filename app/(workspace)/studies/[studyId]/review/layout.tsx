import type { ReactNode } from 'react';
import { ReviewNav } from '@/components/review/review-nav';

/** The Review tab: threads and suggestions (this folder's page), versions and sign-off, activity. */
export default async function ReviewLayout({ children, params }: { children: ReactNode; params: Promise<{ studyId: string }> }) {
  const { studyId } = await params;
  return (
    <div className="space-y-4">
      <ReviewNav studyId={studyId} />
      {children}
    </div>
  );
}

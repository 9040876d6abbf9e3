import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { findTab } from '@/lib/study-tabs';

export async function generateMetadata({ params }: { params: Promise<{ tab: string }> }): Promise<Metadata> {
  const tab = findTab((await params).tab);
  return { title: tab?.label ?? 'Not found' };
}

/** Tabs whose capability is not built yet: an honest placeholder, with no numbers. A built tab has its own folder. */
export default async function StudyTabPage({ params }: { params: Promise<{ studyId: string; tab: string }> }) {
  const tab = findTab((await params).tab);
  if (!tab || tab.built) notFound();
  return (
    <section aria-labelledby="tab-heading" className="max-w-2xl rounded-lg border border-dashed border-line bg-white p-6">
      <h2 id="tab-heading" className="text-lg font-bold">
        {tab.label}: not built yet
      </h2>
      <p className="mt-2 text-sm">This part of Unitwise is not available yet. When it is, it will offer:</p>
      <p className="mt-2 text-sm text-muted">{tab.summary}</p>
    </section>
  );
}

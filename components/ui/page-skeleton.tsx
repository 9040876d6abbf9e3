/** Placeholder while a tab's data loads (the tabs' loading.tsx files). */
export function PageSkeleton() {
  return (
    <div role="status" aria-label="Loading" className="animate-pulse space-y-4">
      <div className="h-8 w-64 rounded bg-slate-200" />
      <div className="h-4 w-96 max-w-full rounded bg-slate-200" />
      <div className="h-64 rounded bg-slate-200" />
    </div>
  );
}

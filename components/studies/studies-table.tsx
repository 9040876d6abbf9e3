'use client';

import { formatDate, plural } from '@/lib/format';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { flexRender, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';
import Link from 'next/link';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import { useEffect, useMemo, useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { STATUS_WORDS } from '@/components/review/review-banner';
import { apiFetch } from '@/lib/api/client';
import type { StudyDto, StudyPage as Page } from '@/lib/api/dto';

type SortKey = 'title' | 'status' | 'role' | 'updated' | 'created';

const STATUS_LABEL: Record<string, string> = STATUS_WORDS;

/**
 * The studies of one workspace: search, status filter, sort and pages, all kept in the URL so a
 * view can be bookmarked and shared. Sorting and paging happen in the database.
 */
/** Columns shown from the sm breakpoint up; below it the title cell carries their text. */
const WIDE_ONLY = new Set(['role', 'updated']);

export function StudiesTable({ workspaceId }: { workspaceId: string }) {
  const router = useRouter();
  const pathname = usePathname();
  const params = useSearchParams();
  const q = params.get('q') ?? '';
  const status = params.get('status') ?? 'active';
  const sort = (params.get('sort') ?? 'updated') as SortKey;
  const dir = (params.get('dir') ?? 'desc') as 'asc' | 'desc';
  const page = Math.max(1, Number(params.get('page') ?? '1') || 1);
  const [search, setSearch] = useState(q);

  function update(next: Record<string, string | null>) {
    const sp = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(next)) {
      if (v === null || v === '') sp.delete(k);
      else sp.set(k, v);
    }
    router.replace(`${pathname}?${sp.toString()}`, { scroll: false });
  }

  // Search as you type, without a request per keystroke.
  useEffect(() => {
    if (search === q) return;
    const t = setTimeout(() => update({ q: search || null, page: null }), 300);
    return () => clearTimeout(t);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [search]);

  const query = useQuery({
    queryKey: ['studies', workspaceId, q, status, sort, dir, page],
    queryFn: () =>
      apiFetch<Page>(
        `/api/v1/studies?${new URLSearchParams({ workspaceId, q, status, sort, dir, page: String(page), pageSize: '10' }).toString()}`,
      ),
    placeholderData: keepPreviousData,
  });

  const columns = useMemo<ColumnDef<StudyDto>[]>(
    () => [
      {
        id: 'title',
        header: 'Title',
        cell: ({ row }) => (
          <div>
            <Link href={`/studies/${row.original.id}`} className="font-semibold text-brand underline">
              {row.original.title}
            </Link>
            {row.original.description && <p className="mt-0.5 line-clamp-1 text-xs text-muted">{row.original.description}</p>}
            {/* On a phone the role and date columns give way to this line, so that the table fits without scrolling sideways. */}
            <p className="mt-0.5 text-xs text-muted sm:hidden">
              <span className="capitalize">{row.original.role}</span> · changed <time dateTime={row.original.updatedAt}>{formatDate(row.original.updatedAt)}</time>
            </p>
          </div>
        ),
      },
      { id: 'status', header: 'Status', cell: ({ row }) => <Badge tone={row.original.status === 'archived' ? 'neutral' : 'brand'}>{STATUS_LABEL[row.original.status]}</Badge> },
      { id: 'role', header: 'Your role', cell: ({ row }) => <span className="capitalize">{row.original.role}</span> },
      {
        id: 'updated',
        header: 'Last changed',
        cell: ({ row }) => <time dateTime={row.original.updatedAt}>{formatDate(row.original.updatedAt)}</time>,
      },
    ],
    [],
  );

  const data = query.data;
  const table = useReactTable({
    data: data?.items ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    rowCount: data?.total ?? 0,
  });

  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;

  return (
    <section aria-labelledby="studies-heading" className="space-y-4">
      <h2 id="studies-heading" className="sr-only">
        Studies
      </h2>
      <div className="flex flex-wrap items-end gap-3">
        <div className="min-w-56 flex-1">
          <label htmlFor="study-search" className="block text-sm font-semibold">
            Search studies
          </label>
          <input
            id="study-search"
            type="search"
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            placeholder="Title or description"
            className="mt-1 block w-full rounded-md border border-line bg-white px-3 py-2 text-sm"
          />
        </div>
        <div>
          <label htmlFor="study-status" className="block text-sm font-semibold">
            Show
          </label>
          <select
            id="study-status"
            value={status}
            onChange={(e) => update({ status: e.target.value === 'active' ? null : e.target.value, page: null })}
            className="mt-1 block rounded-md border border-line bg-white px-3 py-2 text-sm"
          >
            <option value="active">Current studies</option>
            <option value="draft">Drafts</option>
            <option value="in-review">In review</option>
            <option value="signed-off">Signed off</option>
            <option value="archived">Archived</option>
            <option value="all">All</option>
          </select>
        </div>
      </div>

      {query.isError && <Alert tone="error" live>{(query.error as Error).message}</Alert>}

      <div className="overflow-x-auto rounded-lg border border-line bg-white">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">
            Studies in this workspace, sorted by {sort} {dir === 'asc' ? 'ascending' : 'descending'}
          </caption>
          <thead className="border-b border-line bg-slate-50">
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const key = h.column.id as SortKey;
                  const activeSort = sort === key;
                  return (
                    <th
                      key={h.id}
                      scope="col"
                      aria-sort={activeSort ? (dir === 'asc' ? 'ascending' : 'descending') : 'none'}
                      className={`px-3 py-2 font-semibold sm:px-4 ${WIDE_ONLY.has(key) ? 'hidden sm:table-cell' : ''}`}
                    >
                      <button
                        type="button"
                        onClick={() => update({ sort: key, dir: activeSort && dir === 'desc' ? 'asc' : 'desc', page: null })}
                        className="inline-flex items-center gap-1 hover:text-brand"
                      >
                        {flexRender(h.column.columnDef.header, h.getContext())}
                        <span aria-hidden="true" className="text-muted">
                          {activeSort ? (dir === 'asc' ? '▲' : '▼') : '↕'}
                        </span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-line last:border-0">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`px-3 py-3 align-top sm:px-4 ${WIDE_ONLY.has(cell.column.id) ? 'hidden sm:table-cell' : ''}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {data && data.items.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-4 py-8 text-center text-muted">
                  {q || status !== 'active' ? 'No studies match this search.' : 'No studies yet. Create the first one above.'}
                </td>
              </tr>
            )}
            {!data && query.isLoading && (
              <tr>
                <td colSpan={columns.length} className="px-4 py-8 text-center text-muted">
                  Loading studies…
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <nav aria-label="Pages of studies" className="flex items-center justify-between text-sm">
        <p aria-live="polite">
          {data ? `${plural(data.total, 'study')} · page ${page} of ${pages}` : ''}
        </p>
        <div className="flex gap-2">
          <button
            type="button"
            disabled={page <= 1}
            onClick={() => update({ page: String(page - 1) })}
            className="rounded-md border border-line bg-white px-3 py-1.5 font-semibold disabled:opacity-60"
          >
            Previous
          </button>
          <button
            type="button"
            disabled={page >= pages}
            onClick={() => update({ page: String(page + 1) })}
            className="rounded-md border border-line bg-white px-3 py-1.5 font-semibold disabled:opacity-60"
          >
            Next
          </button>
        </div>
      </nav>
    </section>
  );
}

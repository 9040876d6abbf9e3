import type { ReactNode } from 'react';

type Tone = 'info' | 'error' | 'success' | 'caution';

const TONES: Record<Tone, string> = {
  info: 'border-brand bg-brand-light text-ink',
  error: 'border-danger bg-danger-light text-danger',
  success: 'border-ok bg-ok-light text-ok',
  caution: 'border-caution bg-caution-light text-caution',
};

/** A message box. `live` makes it an aria-live region, for results of an action. */
export function Alert({ tone = 'info', title, children, live = false }: { tone?: Tone; title?: string; children?: ReactNode; live?: boolean }) {
  return (
    <div
      role={live ? (tone === 'error' ? 'alert' : 'status') : undefined}
      className={`rounded-md border-l-4 px-4 py-3 text-sm ${TONES[tone]}`}
    >
      {title && <p className="font-semibold">{title}</p>}
      {children && <div className={title ? 'mt-1' : ''}>{children}</div>}
    </div>
  );
}

/** An always-present live region that announces the outcome of a form; empty when idle. */
export function FormStatus({ state }: { state: { status: string; message?: string } | null }) {
  return (
    <div aria-live="polite" aria-atomic="true">
      {state?.message && (
        <Alert live tone={state.status === 'error' ? 'error' : state.status === 'success' ? 'success' : 'info'}>
          {state.message}
        </Alert>
      )}
    </div>
  );
}

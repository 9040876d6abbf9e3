import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

/**
 * A labelled form control with optional help and an error that screen readers announce:
 * the control points at both through aria-describedby, and aria-invalid marks the error.
 */
interface FieldShellProps {
  label: string;
  help?: ReactNode;
  error?: string;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
}

function FieldShell({ label, help, error, children }: FieldShellProps) {
  const id = useId();
  const helpId = help ? `${id}-help` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [helpId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-semibold text-ink">
        {label}
      </label>
      {children({ id, describedBy, invalid: Boolean(error) })}
      {help && (
        <p id={helpId} className="text-sm text-muted">
          {help}
        </p>
      )}
      {error && (
        <p id={errorId} className="text-sm font-medium text-danger">
          {error}
        </p>
      )}
    </div>
  );
}

const control =
  'block w-full rounded-md border border-line bg-white px-3 py-2 text-sm text-ink placeholder:text-muted aria-[invalid=true]:border-danger';

type InputProps = InputHTMLAttributes<HTMLInputElement> & { label: string; help?: ReactNode; error?: string };

export const TextField = forwardRef<HTMLInputElement, InputProps>(function TextField({ label, help, error, className = '', ...props }, ref) {
  return (
    <FieldShell label={label} help={help} error={error}>
      {({ id, describedBy, invalid }) => (
        <input ref={ref} id={id} aria-describedby={describedBy} aria-invalid={invalid} className={`${control} ${className}`} {...props} />
      )}
    </FieldShell>
  );
});

type TextAreaProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { label: string; help?: ReactNode; error?: string };

export const TextAreaField = forwardRef<HTMLTextAreaElement, TextAreaProps>(function TextAreaField(
  { label, help, error, className = '', ...props },
  ref,
) {
  return (
    <FieldShell label={label} help={help} error={error}>
      {({ id, describedBy, invalid }) => (
        <textarea ref={ref} id={id} aria-describedby={describedBy} aria-invalid={invalid} className={`${control} ${className}`} {...props} />
      )}
    </FieldShell>
  );
});

type SelectProps = SelectHTMLAttributes<HTMLSelectElement> & { label: string; help?: ReactNode; error?: string };

export const SelectField = forwardRef<HTMLSelectElement, SelectProps>(function SelectField(
  { label, help, error, className = '', children, ...props },
  ref,
) {
  return (
    <FieldShell label={label} help={help} error={error}>
      {({ id, describedBy, invalid }) => (
        <select ref={ref} id={id} aria-describedby={describedBy} aria-invalid={invalid} className={`${control} ${className}`} {...props}>
          {children}
        </select>
      )}
    </FieldShell>
  );
});

/**
 * Labelled form fields with a hint and the field's error beside it. The label text is the
 * accessible name (tests find inputs by it), errors are tied in with aria-describedby.
 */
import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";

const CONTROL =
  "block w-full rounded-md border bg-white px-3 py-2 text-base text-ink-900 shadow-sm sm:text-sm " +
  "placeholder:text-ink-400 focus:outline-2 focus:outline-offset-0 focus:outline-tide-600 " +
  "disabled:bg-ink-50 disabled:text-ink-500";

function controlClass(hasError: boolean): string {
  return `${CONTROL} ${hasError ? "border-storm-500" : "border-ink-200"}`;
}

interface FieldFrameProps {
  id: string;
  label: string;
  hint?: ReactNode;
  errors?: string[];
  optional?: boolean;
  children: ReactNode;
  className?: string;
}

/** The hint gives way to the error (which restates the rule), so only one is referenced. */
function describedBy(id: string, hint: unknown, errors?: string[]): string | undefined {
  const ids = [errors?.length ? `${id}-error` : hint ? `${id}-hint` : null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}

/** id, class and aria wiring shared by every control. */
function controlProps(id: string, hint: unknown, errors?: string[]) {
  return {
    id,
    className: controlClass(Boolean(errors?.length)),
    "aria-invalid": errors?.length ? true : undefined,
    "aria-describedby": describedBy(id, hint, errors),
  };
}

function FieldFrame({ id, label, hint, errors, optional, children, className = "" }: FieldFrameProps) {
  return (
    <div className={className}>
      <label htmlFor={id} className="mb-1 block text-sm font-medium text-ink-800">
        {label}
        {optional ? <span className="ml-1 font-normal text-ink-500">(optional)</span> : null}
      </label>
      {children}
      {hint && !errors?.length ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-500">
          {hint}
        </p>
      ) : null}
      <FieldErrors id={`${id}-error`} errors={errors} />
    </div>
  );
}

export function FieldErrors({ id, errors }: { id: string; errors?: string[] }) {
  if (!errors?.length) return null;
  return (
    <p id={id} className="mt-1 flex items-start gap-1 text-sm text-storm-700">
      <span aria-hidden="true" className="font-bold">!</span>
      <span>{errors.join(" ")}</span>
    </p>
  );
}

type Common = { id: string; label: string; hint?: ReactNode; errors?: string[]; optional?: boolean; className?: string };

export function TextField({ id, label, hint, errors, optional, className, ...input }: Common & InputHTMLAttributes<HTMLInputElement>) {
  return (
    <FieldFrame id={id} label={label} hint={hint} errors={errors} optional={optional} className={className}>
      <input
        {...controlProps(id, hint, errors)}
        {...input}
      />
    </FieldFrame>
  );
}

export function TextAreaField({ id, label, hint, errors, optional, className, ...input }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return (
    <FieldFrame id={id} label={label} hint={hint} errors={errors} optional={optional} className={className}>
      <textarea
        {...controlProps(id, hint, errors)}
        {...input}
      />
    </FieldFrame>
  );
}

export function SelectField({
  id,
  label,
  hint,
  errors,
  optional,
  className,
  options,
  ...select
}: Common & SelectHTMLAttributes<HTMLSelectElement> & { options: { value: string; label: string }[] }) {
  return (
    <FieldFrame id={id} label={label} hint={hint} errors={errors} optional={optional} className={className}>
      <select
        {...controlProps(id, hint, errors)}
        {...select}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FieldFrame>
  );
}

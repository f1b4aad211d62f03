import { getInputProps, getSelectProps, getTextareaProps, type FieldMetadata } from "@conform-to/react";

/** Small Conform-wired inputs for the organizer forms: label, input, hint or error beside it. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyField = FieldMetadata<any, any, any>;

function Err({ field }: { field: AnyField }) {
  if (!field.errors?.length) return null;
  return (
    <p id={`${field.id}-error`} className="field-error" role="alert">
      {field.errors.join(" ")}
    </p>
  );
}

export function Input({
  field,
  label,
  type = "text",
  hint,
  className = "",
  step,
  list,
  placeholder,
}: {
  field: AnyField;
  label: string;
  type?: "text" | "number" | "datetime-local";
  hint?: string;
  className?: string;
  step?: string;
  list?: string;
  placeholder?: string;
}) {
  return (
    <div className={`mb-4 ${className}`}>
      <label htmlFor={field.id} className="label">
        {label}
      </label>
      <input
        {...getInputProps(field, { type })}
        key={field.key}
        step={step}
        list={list}
        placeholder={placeholder}
        className="field"
        aria-describedby={field.errors ? `${field.id}-error` : hint ? `${field.id}-hint` : undefined}
      />
      {hint && !field.errors && (
        <p id={`${field.id}-hint`} className="mt-1 text-xs text-mute">
          {hint}
        </p>
      )}
      <Err field={field} />
    </div>
  );
}

export function TextArea({ field, label, hint, rows = 3 }: { field: AnyField; label: string; hint?: string; rows?: number }) {
  return (
    <div className="mb-4">
      <label htmlFor={field.id} className="label">
        {label}
      </label>
      <textarea {...getTextareaProps(field)} key={field.key} rows={rows} className="field" aria-describedby={field.errors ? `${field.id}-error` : undefined} />
      {hint && !field.errors && <p className="mt-1 text-xs text-mute">{hint}</p>}
      <Err field={field} />
    </div>
  );
}

export function Select({ field, label, options, hint, className = "" }: { field: AnyField; label: string; options: { value: string; label: string }[]; hint?: string; className?: string }) {
  return (
    <div className={`mb-4 ${className}`}>
      <label htmlFor={field.id} className="label">
        {label}
      </label>
      <select {...getSelectProps(field)} key={field.key} className="field" aria-describedby={field.errors ? `${field.id}-error` : undefined}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {hint && !field.errors && <p className="mt-1 text-xs text-mute">{hint}</p>}
      <Err field={field} />
    </div>
  );
}

export function Check({ field, label, hint }: { field: AnyField; label: string; hint?: string }) {
  return (
    <div className="mb-4">
      <label className="flex items-center gap-2 text-sm font-medium text-ink">
        <input {...getInputProps(field, { type: "checkbox" })} key={field.key} className="h-4 w-4 accent-signal" />
        {label}
      </label>
      {hint && <p className="mt-1 text-xs text-mute">{hint}</p>}
      <Err field={field} />
    </div>
  );
}

/** An input inside a table row: the label is for screen readers only, the error sits under the input. */
export function CellInput({ field, label, type = "text", className = "" }: { field: AnyField; label: string; type?: "text" | "number"; className?: string }) {
  return (
    <div className={className}>
      <label htmlFor={field.id} className="sr-only">
        {label}
      </label>
      <input {...getInputProps(field, { type })} key={field.key} className="field" aria-describedby={field.errors ? `${field.id}-error` : undefined} step={type === "number" ? "any" : undefined} />
      <Err field={field} />
    </div>
  );
}

export function CellSelect({ field, label, options }: { field: AnyField; label: string; options: readonly string[] }) {
  return (
    <div>
      <label htmlFor={field.id} className="sr-only">
        {label}
      </label>
      <select {...getSelectProps(field)} key={field.key} className="field">
        {options.map((o) => (
          <option key={o} value={o}>
            {o}
          </option>
        ))}
      </select>
      <Err field={field} />
    </div>
  );
}

export { Err as FieldError };

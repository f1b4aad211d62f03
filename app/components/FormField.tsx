import { getInputProps, type FieldMetadata } from "@conform-to/react";

/** A labelled input with its error beside it, wired to a Conform field. */
export function FormField({
  field,
  label,
  type = "text",
  hint,
  autoComplete,
}: {
  field: FieldMetadata<string | number | undefined>;
  label: string;
  type?: "text" | "email" | "password" | "number" | "datetime-local" | "url";
  hint?: string;
  autoComplete?: string;
}) {
  const errorId = `${field.id}-error`;
  return (
    <div className="mb-4">
      <label htmlFor={field.id} className="label">
        {label}
      </label>
      <input {...getInputProps(field, { type })} autoComplete={autoComplete} className="field" aria-describedby={field.errors ? errorId : undefined} />
      {hint && !field.errors && <p className="mt-1 text-xs text-mute">{hint}</p>}
      {field.errors && (
        <p id={errorId} className="field-error" role="alert">
          {field.errors.join(" ")}
        </p>
      )}
    </div>
  );
}

export function FormErrors({ errors }: { errors?: string[] }) {
  if (!errors?.length) return null;
  return (
    <div role="alert" className="mb-4 rounded-md border border-fail bg-fail-soft px-3 py-2 text-sm font-medium text-fail">
      {errors.join(" ")}
    </div>
  );
}

import { getInputProps, type FieldMetadata } from "@conform-to/react";

export function ErrorList({ id, errors }: { id?: string; errors?: string[] | null }) {
  if (!errors?.length) return null;
  return (
    <ul id={id} className="field-error">
      {errors.map((error) => (
        <li key={error}>{error}</li>
      ))}
    </ul>
  );
}

export function TextField({
  label,
  field,
  type = "text",
  hint,
  ...rest
}: {
  label: string;
  field: FieldMetadata<string | number | undefined | null>;
  type?: "text" | "email" | "password" | "number" | "datetime-local" | "date";
  hint?: string;
} & Omit<React.InputHTMLAttributes<HTMLInputElement>, "type">) {
  const props = getInputProps(field, { type, ariaDescribedBy: hint ? `${field.id}-hint` : undefined });
  return (
    <div>
      <label htmlFor={field.id} className="field-label">
        {label}
      </label>
      {hint ? (
        <p id={`${field.id}-hint`} className="text-xs text-slate-ft">
          {hint}
        </p>
      ) : null}
      <input {...props} {...rest} key={props.key} className="field-input" />
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
  );
}

export function FormErrors({ errors, id }: { errors?: string[] | null; id?: string }) {
  if (!errors?.length) return null;
  return (
    <div
      id={id}
      role="alert"
      className="rounded-md border border-danger-700 bg-danger-50 p-3 text-sm font-medium text-danger-700"
    >
      {errors.map((error) => (
        <p key={error}>{error}</p>
      ))}
    </div>
  );
}

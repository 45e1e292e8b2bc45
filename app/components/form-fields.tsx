import { getInputProps, getSelectProps, getTextareaProps, type FieldMetadata } from "@conform-to/react";

// Any field of any form: the inputs below only need its name, id, errors and initial value.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyField = FieldMetadata<any, any, any>;

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

/** The id of a field's hint, for aria-describedby; undefined when there is no hint. */
const hintIdOf = (field: AnyField, hint: string | undefined) => (hint ? `${field.id}-hint` : undefined);

function FieldHint({ field, hint }: { field: AnyField; hint?: string }) {
  return hint ? (
    <p id={hintIdOf(field, hint)} className="text-xs text-slate-ft">
      {hint}
    </p>
  ) : null;
}

/**
 * A label above its hint, the control and the field's errors. In a grid row whose fields have hints
 * of different lengths, `hintBelow` keeps the controls level by putting the hint under the control.
 */
function LabelledField({
  label,
  field,
  hint,
  hintBelow,
  className,
  children,
}: {
  label: string;
  field: AnyField;
  hint?: string;
  hintBelow?: boolean;
  className?: string;
  children: React.ReactNode;
}) {
  return (
    <div className={className}>
      <label htmlFor={field.id} className="field-label">
        {label}
      </label>
      {hintBelow ? null : <FieldHint field={field} hint={hint} />}
      {children}
      {hintBelow ? <FieldHint field={field} hint={hint} /> : null}
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
  );
}

export function TextField({
  label,
  field,
  type = "text",
  hint,
  hintBelow,
  ...rest
}: {
  label: string;
  field: AnyField;
  type?: "text" | "email" | "password" | "number" | "datetime-local" | "date";
  hint?: string;
  hintBelow?: boolean;
} & Omit<React.InputHTMLAttributes<HTMLInputElement>, "type">) {
  const props = getInputProps(field, { type, ariaDescribedBy: hintIdOf(field, hint) });
  return (
    <LabelledField label={label} field={field} hint={hint} hintBelow={hintBelow}>
      <input {...props} {...rest} key={props.key} className="field-input" />
    </LabelledField>
  );
}

/** Characters of a choice that a narrow column shows whole (common practice, no source). */
const LONG_CHOICE = 30;

export function SelectField({
  label,
  field,
  options,
  hint,
  hintBelow,
  placeholder,
  disabled,
  onChange,
}: {
  label: string;
  field: AnyField;
  options: Array<{ value: string; label: string }>;
  hint?: string;
  hintBelow?: boolean;
  placeholder?: string;
  disabled?: boolean;
  onChange?: (event: React.ChangeEvent<HTMLSelectElement>) => void;
}) {
  const props = getSelectProps(field, { ariaDescribedBy: hintIdOf(field, hint) });
  const labels = [placeholder ?? "", ...options.map((option) => option.label)];
  // A choice too long for a narrow column gets a wider one; on a phone, where the closed list
  // cuts it off, the whole of the chosen label is repeated under it.
  const long = labels.some((text) => text.length > LONG_CHOICE);
  const chosen =
    options.find((option) => option.value === field.value)?.label ?? (field.value ? undefined : placeholder);
  return (
    <LabelledField
      label={label}
      field={field}
      hint={hint}
      hintBelow={hintBelow}
      className={long ? "min-w-0 sm:col-span-2" : "min-w-0"}
    >
      <select
        {...props}
        key={props.key}
        className="field-input"
        disabled={disabled}
        onChange={onChange}
        title={chosen && chosen.length > LONG_CHOICE ? chosen : undefined}
      >
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      {chosen && chosen.length > LONG_CHOICE ? (
        <p aria-hidden="true" className="mt-1 text-sm text-slate-ft sm:hidden" data-testid="chosen-in-full">
          {chosen}
        </p>
      ) : null}
    </LabelledField>
  );
}

export function TextAreaField({
  label,
  field,
  hint,
  rows = 3,
  disabled,
}: {
  label: string;
  field: AnyField;
  hint?: string;
  rows?: number;
  disabled?: boolean;
}) {
  const props = getTextareaProps(field, { ariaDescribedBy: hintIdOf(field, hint) });
  return (
    <LabelledField label={label} field={field} hint={hint}>
      <textarea {...props} key={props.key} rows={rows} className="field-input" disabled={disabled} />
    </LabelledField>
  );
}

/** A checkbox inside its label (a large target), the hint and errors below. */
export function CheckboxField({
  label,
  field,
  hint,
  disabled,
}: {
  label: string;
  field: AnyField;
  hint?: string;
  disabled?: boolean;
}) {
  const props = getInputProps(field, { type: "checkbox", ariaDescribedBy: hintIdOf(field, hint) });
  return (
    <div>
      <label className="flex min-h-11 items-center gap-2 font-medium">
        <input {...props} key={props.key} className="h-5 w-5" disabled={disabled} />
        {label}
      </label>
      <FieldHint field={field} hint={hint} />
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

import { getInputProps, getSelectProps, getTextareaProps, type FieldMetadata } from "@conform-to/react";
import { ErrorList } from "./form-fields";

// Any field of any form: the inputs below only need its name, id, errors and initial value.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Field = FieldMetadata<any, any, any>;

export function SelectField({
  label,
  field,
  options,
  hint,
  placeholder,
  disabled,
}: {
  label: string;
  field: Field;
  options: Array<{ value: string; label: string }>;
  hint?: string;
  placeholder?: string;
  disabled?: boolean;
}) {
  const props = getSelectProps(field, {
    ariaDescribedBy: hint ? `${field.id}-hint` : undefined,
  });
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
      <select {...props} key={props.key} className="field-input" disabled={disabled}>
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
  );
}

export function CheckboxField({
  label,
  field,
  hint,
  disabled,
}: {
  label: string;
  field: Field;
  hint?: string;
  disabled?: boolean;
}) {
  const props = getInputProps(field, {
    type: "checkbox",
    ariaDescribedBy: hint ? `${field.id}-hint` : undefined,
  });
  return (
    <div>
      <label className="flex min-h-11 items-center gap-2 font-medium">
        <input {...props} key={props.key} className="h-5 w-5" disabled={disabled} />
        {label}
      </label>
      {hint ? (
        <p id={`${field.id}-hint`} className="text-xs text-slate-ft">
          {hint}
        </p>
      ) : null}
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
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
  field: Field;
  hint?: string;
  rows?: number;
  disabled?: boolean;
}) {
  const props = getTextareaProps(field, {
    ariaDescribedBy: hint ? `${field.id}-hint` : undefined,
  });
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
      <textarea {...props} key={props.key} rows={rows} className="field-input" disabled={disabled} />
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
  );
}

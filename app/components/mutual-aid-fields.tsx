import type { FieldMetadata } from "@conform-to/react";
import { MUTUAL_AID_LABEL } from "~/lib/foam/vocabulary";
import { TextField } from "./form-fields";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type AnyField = FieldMetadata<any, any, any>;

/** The switch between one of our apparatus and another agency's unit on a discharge line. */
export function MutualAidSwitch({
  id,
  checked,
  onChange,
}: {
  id: string;
  checked: boolean;
  onChange: (checked: boolean) => void;
}) {
  return (
    <label htmlFor={id} className="flex min-h-11 items-center gap-2 text-sm font-medium">
      <input
        id={id}
        type="checkbox"
        className="h-5 w-5"
        checked={checked}
        onChange={(event) => onChange(event.currentTarget.checked)}
      />
      Another agency&apos;s unit ({MUTUAL_AID_LABEL.toLowerCase()})
    </label>
  );
}

/**
 * Another agency's unit, named as its officer would: the agency and the unit id. Its foam system is
 * not in our apparatus list, so the line is counted but not checked against a proportioner.
 */
export function MutualAidFields({ agency, unit }: { agency: AnyField; unit: AnyField }) {
  return (
    <>
      <TextField label="Mutual-aid agency" field={agency} hint="As they name themselves." />
      <TextField label="Their unit id" field={unit} hint="No capacity checks for their unit." />
    </>
  );
}

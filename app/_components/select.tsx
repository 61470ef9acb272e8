import type { ReactNode, SelectHTMLAttributes } from "react";
import { FieldError, FieldHint, FieldLabel, describedBy, fieldId } from "./field-parts";

export interface SelectOption {
  value: string;
  label: string;
}

export type SelectProps = {
  label: ReactNode;
  name: string;
  id?: string;
  options: readonly SelectOption[];
  /** Shown first with an empty value, e.g. "Choose a source…". */
  placeholder?: string;
  hint?: ReactNode;
  error?: readonly string[] | string | null;
  optional?: boolean;
  className?: string;
} & Omit<SelectHTMLAttributes<HTMLSelectElement>, "name" | "id" | "className">;

/** A labelled native select: keyboard and screen-reader behaviour come from the platform. */
export function Select({ label, name, id, options, placeholder, hint, error, optional, className, ...select }: SelectProps) {
  const selectId = id ?? fieldId(name);
  const invalid = Boolean(error && error.length);
  return (
    <div className={["field", className].filter(Boolean).join(" ")}>
      <FieldLabel htmlFor={selectId} optional={optional}>
        {label}
      </FieldLabel>
      <select
        className="select"
        id={selectId}
        name={name}
        aria-invalid={invalid || undefined}
        aria-describedby={describedBy(selectId, { hint, error: invalid })}
        {...select}
      >
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <FieldHint id={selectId}>{hint}</FieldHint>
      <FieldError id={selectId} messages={error} />
    </div>
  );
}

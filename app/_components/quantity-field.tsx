import type { ReactNode } from "react";
import { FieldError, FieldHint, FieldLabel, describedBy, fieldId } from "./field-parts";

export interface UnitChoice {
  id: string;
  label: string;
}

export interface QuantityFieldProps {
  label: ReactNode;
  /** Base name; the inputs are `${name}.value` and `${name}.unit`. */
  name: string;
  value: string;
  unit: string;
  units: readonly UnitChoice[];
  onValueChange: (value: string) => void;
  onUnitChange: (unit: string) => void;
  /** The value in the canonical unit, e.g. "= 800 mm/s", announced with the field. */
  canonical?: ReactNode;
  hint?: ReactNode;
  error?: readonly string[] | string | null;
  optional?: boolean;
  required?: boolean;
  className?: string;
  /** Rendered at the end of the line under the input (e.g. a provenance choice). */
  aside?: ReactNode;
}

/**
 * A number typed as text (so "0,8" or "1e3" reach the parser as written) with the unit as a
 * suffix select. The select has its own accessible name ("… unit") and follows the input in tab order.
 */
export function QuantityField({ label, name, value, unit, units, onValueChange, onUnitChange, canonical, hint, error, optional, required, className, aside }: QuantityFieldProps) {
  const id = fieldId(`${name}.value`);
  const unitId = fieldId(`${name}.unit`);
  const invalid = Boolean(error && error.length);
  const canonicalId = `${id}-canonical`;
  return (
    <div className={["field", className].filter(Boolean).join(" ")}>
      <FieldLabel htmlFor={id} optional={optional}>
        {label}
      </FieldLabel>
      <div className="quantity">
        <input
          className="input"
          id={id}
          name={`${name}.value`}
          inputMode="decimal"
          autoComplete="off"
          spellCheck={false}
          value={value}
          required={required}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy(id, { hint, error: invalid, extra: canonicalId })}
          onChange={(e) => onValueChange(e.target.value)}
        />
        <select className="select" id={unitId} name={`${name}.unit`} aria-label={`${typeof label === "string" ? label : name} unit`} value={unit} onChange={(e) => onUnitChange(e.target.value)}>
          {units.map((u) => (
            <option key={u.id} value={u.id}>
              {u.label}
            </option>
          ))}
        </select>
      </div>
      <div className="field__under">
        <span className="field__canonical" id={canonicalId} aria-live="polite">
          {canonical}
        </span>
        {aside}
      </div>
      <FieldHint id={id}>{hint}</FieldHint>
      <FieldError id={id} messages={error} />
    </div>
  );
}

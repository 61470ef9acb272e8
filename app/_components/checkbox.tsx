import type { InputHTMLAttributes, ReactNode } from "react";
import { fieldId } from "./field-parts";

export type CheckboxProps = {
  label: ReactNode;
  name: string;
  id?: string;
  hint?: ReactNode;
} & Omit<InputHTMLAttributes<HTMLInputElement>, "type" | "name" | "id">;

/** A checkbox with its label wrapped around it, so the whole text is the click target. */
export function Checkbox({ label, name, id, hint, ...input }: CheckboxProps) {
  const inputId = id ?? fieldId(`${name}-${String(input.value ?? "on")}`);
  return (
    <label className="checkbox" htmlFor={inputId}>
      <input type="checkbox" id={inputId} name={name} aria-describedby={hint ? `${inputId}-hint` : undefined} {...input} />
      <span>
        {label}
        {hint ? (
          <span className="field__hint" id={`${inputId}-hint`} style={{ display: "block" }}>
            {hint}
          </span>
        ) : null}
      </span>
    </label>
  );
}

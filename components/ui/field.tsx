import type { InputHTMLAttributes, SelectHTMLAttributes } from "react";
import { cn } from "@/components/ui/cn";

const inputClasses = (invalid: boolean) =>
  cn(
    "block w-full min-h-11 rounded-lg border bg-white px-3 py-2 text-base text-loam-900 placeholder:text-loam-500",
    invalid ? "border-beet-600" : "border-loam-300",
  );

interface FieldProps {
  label: string;
  name: string;
  errors?: string[];
  hint?: string;
  /** Needed when two forms on one page share a field name, so ids stay unique. */
  id?: string;
}

/** A labelled input with its hint and errors linked through aria-describedby. */
export function TextField({ label, name, errors, hint, className, id, ...props }: FieldProps & InputHTMLAttributes<HTMLInputElement>) {
  const fieldId = id ?? name;
  const errorId = `${fieldId}-error`;
  const hintId = `${fieldId}-hint`;
  const describedBy = [hint ? hintId : null, errors?.length ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cn("space-y-1", className)}>
      <label htmlFor={fieldId} className="block text-sm font-semibold text-loam-900">
        {label}
      </label>
      {hint && (
        <p id={hintId} className="text-sm text-loam-700">
          {hint}
        </p>
      )}
      <input id={fieldId} name={name} aria-invalid={errors?.length ? true : undefined} aria-describedby={describedBy} className={inputClasses(!!errors?.length)} {...props} />
      {errors?.length ? (
        <p id={errorId} className="text-sm font-medium text-beet-700">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

export function SelectField({ label, name, errors, hint, className, children, id, ...props }: FieldProps & SelectHTMLAttributes<HTMLSelectElement>) {
  const fieldId = id ?? name;
  const errorId = `${fieldId}-error`;
  return (
    <div className={cn("space-y-1", className)}>
      <label htmlFor={fieldId} className="block text-sm font-semibold text-loam-900">
        {label}
      </label>
      {hint && <p className="text-sm text-loam-700">{hint}</p>}
      {/* Remounting on a new default keeps a choice after a failed submit; React's form reset would otherwise restore the first default. */}
      <select key={typeof props.defaultValue === "string" ? props.defaultValue : undefined} id={fieldId} name={name} aria-invalid={errors?.length ? true : undefined} aria-describedby={errors?.length ? errorId : undefined} className={inputClasses(!!errors?.length)} {...props}>
        {children}
      </select>
      {errors?.length ? (
        <p id={errorId} className="text-sm font-medium text-beet-700">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

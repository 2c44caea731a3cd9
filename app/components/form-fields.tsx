import { useId } from "react";

interface TextFieldProps extends Omit<React.InputHTMLAttributes<HTMLInputElement>, "name"> {
  name: string;
  label: string;
  error?: string | undefined;
  hint?: string;
}

/** A labelled input whose error is announced and tied to it for screen readers. */
export function TextField({ name, label, error, hint, ...inputProps }: TextFieldProps) {
  const id = useId();
  const described = [hint ? `${id}-hint` : null, error ? `${id}-error` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div>
      <label className="field-label" htmlFor={id}>
        {label}
      </label>
      <input id={id} name={name} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={described} {...inputProps} />
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-ink-faint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="field-error">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function FormError({ message }: { message?: string | undefined }) {
  if (!message) return null;
  return (
    <div role="alert" className="rounded-md border border-[#e2b4b0] bg-danger-wash px-3 py-2 text-sm text-danger">
      {message}
    </div>
  );
}

export function Notice({ children, tone = "info" }: { children: React.ReactNode; tone?: "info" | "success" | "caution" }) {
  const styles = {
    info: "border-rule bg-sheet text-ink-soft",
    success: "border-[#b8d3b3] bg-verified-wash text-verified",
    caution: "border-[#e3cf8f] bg-waiting-wash text-[#5e480a]",
  }[tone];
  return (
    <div role="status" className={`rounded-md border px-3 py-2 text-sm ${styles}`}>
      {children}
    </div>
  );
}

interface SelectFieldProps {
  name: string;
  label: string;
  options: { value: string; label: string }[];
  /** The first option, meaning "no filter" or "none chosen" (value ""). */
  anyLabel?: string;
  defaultValue?: string | undefined;
  className?: string;
  error?: string | undefined;
}

/** A labelled select, as the list filters and forms use it. */
export function SelectField({ name, label, options, anyLabel, defaultValue, className, error }: SelectFieldProps) {
  const id = useId();
  return (
    <div className={className}>
      <label className="field-label" htmlFor={id}>
        {label}
      </label>
      <select id={id} name={name} defaultValue={defaultValue ?? ""} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined}>
        {anyLabel !== undefined ? <option value="">{anyLabel}</option> : null}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {error ? (
        <p id={`${id}-error`} className="field-error">
          {error}
        </p>
      ) : null}
    </div>
  );
}

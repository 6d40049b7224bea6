import { inputClass } from "./button";

/** A labelled input with its validation message; the message is tied to the input for readers. */
export function Field({
  name,
  label,
  hint,
  errors,
  ...input
}: {
  name: string;
  label: string;
  hint?: string;
  errors?: string[];
} & React.InputHTMLAttributes<HTMLInputElement>) {
  const errorId = errors?.length ? `${name}-error` : undefined;
  return (
    <label className="block text-sm">
      <span className="mb-1 block font-medium text-ink">{label}</span>
      <input
        name={name}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={errorId}
        className={inputClass}
        {...input}
      />
      {hint ? <span className="mt-1 block text-ink-soft">{hint}</span> : null}
      {errorId ? (
        <span id={errorId} className="mt-1 block text-alarm-700">
          {errors?.join(" ")}
        </span>
      ) : null}
    </label>
  );
}

/** A labelled input whose errors are announced with it (aria-describedby). */
export function Field({
  label,
  name,
  id = name,
  errors,
  hint,
  ...inputProps
}: { label: string; name: string; id?: string; errors?: string[]; hint?: string } & React.InputHTMLAttributes<HTMLInputElement>) {
  const errorId = `${id}-errors`;
  const hintId = `${id}-hint`;
  const describedBy = [hint ? hintId : null, errors?.length ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-describedby={describedBy}
        aria-invalid={errors?.length ? true : undefined}
        className="block min-h-11 w-full rounded-lg border border-oat-300 bg-white px-3 py-2 text-base text-ink shadow-inner focus:border-moss-600"
        {...inputProps}
      />
      {hint ? (
        <p id={hintId} className="text-xs text-ink-soft">
          {hint}
        </p>
      ) : null}
      {errors?.length ? (
        <ul id={errorId} className="text-sm text-danger-ink">
          {errors.map((error) => (
            <li key={error}>{error}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

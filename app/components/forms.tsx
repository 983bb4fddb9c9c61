import type { InputHTMLAttributes, ReactNode } from "react";

/** A labelled input for the field: label above, big target, its errors below and announced. */
export function Field({
  label,
  name,
  errors,
  hint,
  ...input
}: { label: string; name: string; errors?: string[]; hint?: ReactNode } & InputHTMLAttributes<HTMLInputElement>) {
  const id = input.id ?? `field-${name}`;
  const describedBy = [errors?.length ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block font-semibold">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={describedBy}
        className={`min-h-11 w-full rounded-md border bg-white px-3 text-base ${errors?.length ? "border-clay" : "border-ink/30"}`}
        {...input}
      />
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-ink-soft">
          {hint}
        </p>
      )}
      {errors?.length ? (
        <p id={`${id}-error`} className="text-sm font-medium text-clay" role="alert">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

export function PrimaryButton({ children, ...props }: { children: ReactNode } & React.ButtonHTMLAttributes<HTMLButtonElement>) {
  return (
    <button
      type="submit"
      className="min-h-11 w-full rounded-md bg-moss px-5 font-semibold text-paper hover:bg-moss-deep disabled:opacity-60 sm:w-auto"
      {...props}
    >
      {children}
    </button>
  );
}

export function SecondaryButton({ children, ...props }: { children: ReactNode } & React.ButtonHTMLAttributes<HTMLButtonElement>) {
  return (
    <button type="submit" className="min-h-11 rounded-md border border-ink/30 bg-white/70 px-4 font-medium text-ink hover:bg-white" {...props}>
      {children}
    </button>
  );
}

/** A message about the whole form: a refusal (clay) or a confirmation (moss). */
export function FormMessage({ tone, children }: { tone: "error" | "success" | "info"; children: ReactNode }) {
  const style = tone === "error" ? "border-clay bg-clay/10" : tone === "success" ? "border-moss bg-moss/10" : "border-sky bg-sky/10";
  return (
    <div role={tone === "error" ? "alert" : "status"} className={`rounded-md border-l-4 p-3 ${style}`}>
      {children}
    </div>
  );
}

import { useEffect, useId, useRef, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";
import { useNavigation } from "react-router";

type FieldProps = {
  label: ReactNode;
  name: string;
  error?: string;
  hint?: ReactNode;
  suffix?: string;
} & Omit<InputHTMLAttributes<HTMLInputElement>, "name">;

/** A labelled input with its hint and error tied to it for screen readers. */
export function TextField({ label, name, error, hint, suffix, className, ...input }: FieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <div className="relative">
        <input
          id={id}
          name={name}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={`field-input ${suffix ? "pr-12" : ""}`}
          {...input}
        />
        {suffix ? (
          <span className="pointer-events-none absolute inset-y-0 right-3 flex items-center text-sm text-char-500">
            {suffix}
          </span>
        ) : null}
      </div>
      {hint ? (
        <p id={hintId} className="field-hint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="field-error">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type SelectProps = {
  label: ReactNode;
  name: string;
  error?: string;
  hint?: ReactNode;
  children: ReactNode;
} & Omit<SelectHTMLAttributes<HTMLSelectElement>, "name">;

export function SelectField({ label, name, error, hint, children, className, ...select }: SelectProps) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
        className="field-input"
        {...select}
      >
        {children}
      </select>
      {hint ? (
        <p id={`${id}-hint`} className="field-hint">
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

/**
 * A form-level message after a refused submit (e.g. a failed sign-in or fields to fix), announced to
 * screen readers. It takes focus when it appears, so keyboard users start from the summary (the GOV.UK
 * error-summary pattern; WCAG 2.1 SC 3.3.1), then reach each marked field in order.
 */
export function FormAlert({ children, className = "" }: { children: ReactNode; className?: string }) {
  const ref = useRef<HTMLDivElement>(null);
  const navigation = useNavigation();
  const wasSubmitting = useRef(false);
  useEffect(() => {
    ref.current?.focus();
  }, []);
  // Refused again while the summary is already shown: it stays mounted, so focus it again once the
  // submit has settled (otherwise focus would stay on the submit button, away from the new message).
  useEffect(() => {
    if (navigation.state !== "idle") {
      if (navigation.formMethod) wasSubmitting.current = true;
      return;
    }
    if (wasSubmitting.current) {
      wasSubmitting.current = false;
      ref.current?.focus();
    }
  }, [navigation.state, navigation.formMethod]);
  return (
    <div
      ref={ref}
      tabIndex={-1}
      role="alert"
      className={`rounded-lg border border-alert-600/30 bg-alert-100 px-4 py-3 text-sm font-semibold text-alert-700 ${className}`}
    >
      {children}
    </div>
  );
}

/**
 * The staff's photo picker (site visit, build progress, the finished pit): several JPEG, PNG or
 * WebP photos, the back camera offered on a phone, the limits as its hint, the refusal in its place.
 * `large` sizes it for a crew member's thumb on site.
 */
export function PhotoField({
  label,
  error,
  maxPhotos,
  large = false,
}: {
  label: ReactNode;
  error?: string;
  maxPhotos: number;
  large?: boolean;
}) {
  const id = useId();
  const noteId = error ? `${id}-error` : `${id}-hint`;
  return (
    <div>
      <label htmlFor={id} className={large ? "field-label text-base" : "field-label"}>
        {label}
      </label>
      <input
        id={id}
        name="photos"
        type="file"
        accept="image/jpeg,image/png,image/webp"
        capture="environment"
        multiple
        aria-describedby={noteId}
        aria-invalid={error ? true : undefined}
        className={large ? "field-input min-h-12 text-base" : "field-input"}
      />
      {error ? (
        <p id={noteId} className="field-error">
          {error}
        </p>
      ) : (
        <p id={noteId} className={large ? "field-hint text-sm" : "field-hint"}>
          Up to {maxPhotos} JPEG, PNG or WebP photos, 10 MB each.
        </p>
      )}
    </div>
  );
}

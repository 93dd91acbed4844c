import { useEffect, useRef, useState, type ReactNode } from "react";
import { Form } from "react-router";

/**
 * A destructive action asked twice: the first button opens a short question beside it, and only its
 * "yes" button posts the form. Focus moves to the question and back to the button on "keep it".
 */
export function ConfirmAction({
  label,
  accessibleLabel,
  question,
  confirmLabel,
  keepLabel = "Keep it",
  disabled,
  action,
  children,
}: {
  label: string;
  /** A fuller name for screen readers; it must start with the visible label (WCAG 2.5.3). */
  accessibleLabel?: string;
  question: ReactNode;
  confirmLabel: string;
  keepLabel?: string;
  disabled?: boolean;
  action?: string;
  /** Hidden inputs of the form that is posted on "yes". */
  children: ReactNode;
}) {
  const [isAsking, setIsAsking] = useState(false);
  const questionRef = useRef<HTMLDivElement>(null);
  const openerRef = useRef<HTMLButtonElement>(null);
  const wasAsking = useRef(false);
  useEffect(() => {
    if (isAsking) questionRef.current?.focus();
    else if (wasAsking.current) openerRef.current?.focus();
    wasAsking.current = isAsking;
  }, [isAsking]);
  if (!isAsking) {
    return (
      <button
        ref={openerRef}
        type="button"
        className="btn-quiet"
        disabled={disabled}
        aria-label={accessibleLabel}
        onClick={() => setIsAsking(true)}
      >
        {label}
      </button>
    );
  }
  return (
    <div
      ref={questionRef}
      tabIndex={-1}
      role="group"
      aria-label={accessibleLabel ?? label}
      className="flex max-w-md flex-col gap-3 rounded-lg border border-alert-600/40 bg-alert-100 p-3 text-sm"
    >
      <p className="font-semibold text-char-900">{question}</p>
      <div className="flex flex-wrap gap-2">
        <Form method="post" action={action}>
          {children}
          <button type="submit" className="btn bg-alert-700 text-white hover:bg-alert-600" disabled={disabled}>
            {confirmLabel}
          </button>
        </Form>
        <button type="button" className="btn-quiet" onClick={() => setIsAsking(false)}>
          {keepLabel}
        </button>
      </div>
    </div>
  );
}

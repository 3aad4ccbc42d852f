"use client";
import { useFormStatus } from "react-dom";
import { Button, type ButtonVariant } from "./button";

/** The one submit button: disables itself while the form is pending and tells screen readers why. */
export function SubmitButton({ children, pendingText = "Saving…", variant = "primary" }: { children: React.ReactNode; pendingText?: string; variant?: ButtonVariant }) {
  const { pending } = useFormStatus();
  return (
    <Button type="submit" disabled={pending} aria-disabled={pending} variant={variant}>
      {pending && <span aria-hidden className="size-4 animate-spin rounded-full border-2 border-current border-t-transparent" />}
      <span>{pending ? pendingText : children}</span>
    </Button>
  );
}

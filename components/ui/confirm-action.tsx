"use client";
import { useActionState, useState } from "react";
import { Button, type ButtonVariant } from "./button";
import { Dialog } from "./dialog";
import { FormMessage } from "./form-message";
import { SubmitButton } from "./submit-button";
import type { ActionResult } from "@/lib/validation/action-result";

type FormAction = (previous: ActionResult | null, formData: FormData) => Promise<ActionResult>;

/**
 * A button for a change that needs a second thought (deactivating an account, closing a season): it opens
 * a dialog that says what will happen, and only the dialog's button sends the form. A refusal stays in the
 * dialog; a success closes it and goes to `onDone`, since the row may re-render with other buttons.
 */
export function ConfirmAction({
  label,
  srLabel,
  title,
  children,
  confirmLabel,
  pendingText = "Saving…",
  cancelLabel = "Keep as it is",
  closeLabel,
  variant = "ghost",
  confirmVariant = "danger",
  action,
  fields,
  onDone,
}: {
  label: string;
  /** Words after the label for screen readers, such as whose account it is. */
  srLabel?: string;
  title: string;
  children: React.ReactNode;
  confirmLabel: string;
  pendingText?: string;
  /** The button that closes the dialog without sending. */
  cancelLabel?: string;
  /** The dialog's own close button ("Close" unless given). */
  closeLabel?: string;
  variant?: ButtonVariant;
  confirmVariant?: ButtonVariant;
  action: FormAction;
  fields: Record<string, string | number>;
  onDone: (result: ActionResult) => void;
}) {
  const [open, setOpen] = useState(false);
  const [state, formAction] = useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await action(previous, formData);
    if (result.ok) {
      setOpen(false);
      onDone(result);
      return null;
    }
    return result;
  }, null);
  return (
    <>
      <Button type="button" variant={variant} onClick={() => setOpen(true)}>
        {label}
        {srLabel && <span className="sr-only"> {srLabel}</span>}
      </Button>
      {open && (
        <Dialog title={title} onClose={() => setOpen(false)} closeLabel={closeLabel}>
          <div className="space-y-2 text-base">{children}</div>
          <form action={formAction} className="space-y-3">
            {Object.entries(fields).map(([name, value]) => (
              <input key={name} type="hidden" name={name} value={value} />
            ))}
            <FormMessage state={state} />
            <div className="flex flex-wrap gap-2">
              <SubmitButton variant={confirmVariant} pendingText={pendingText}>
                {confirmLabel}
              </SubmitButton>
              <Button type="button" variant="secondary" onClick={() => setOpen(false)}>
                {cancelLabel}
              </Button>
            </div>
          </form>
        </Dialog>
      )}
    </>
  );
}

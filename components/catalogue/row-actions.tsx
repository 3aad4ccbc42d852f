"use client";
import { createContext, useActionState, useCallback, useContext, useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { SubmitButton } from "@/components/ui/submit-button";
import type { ActionResult } from "@/lib/validation/action-result";

interface Notice {
  ok: boolean;
  text: string;
}

const NoticeContext = createContext<(notice: Notice) => void>(() => {});

/**
 * The live region for what a table's row buttons did. It sits outside the rows because a deleted row
 * unmounts in the same render that brings the result.
 */
export function TableNotices({ children }: { children: React.ReactNode }) {
  const [notice, setNotice] = useState<Notice | null>(null);
  return (
    <NoticeContext.Provider value={setNotice}>
      <div role="status" aria-live="polite" className="mb-3 empty:mb-0">
        {notice && (
          <p
            className={
              notice.ok
                ? "rounded-lg border border-sprout-500 bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700"
                : "rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 text-sm font-medium text-beet-700"
            }
          >
            {notice.text}
          </p>
        )}
      </div>
      {children}
    </NoticeContext.Provider>
  );
}

type FormAction = (previous: ActionResult | null, formData: FormData) => Promise<ActionResult>;

/** Edit (in a dialog) and delete (after a confirmation) for one catalogue row. */
export function RowActions({
  name,
  idField,
  id,
  remove,
  editTitle,
  note,
  renderEdit,
}: {
  name: string;
  idField: string;
  id: number;
  remove: FormAction;
  editTitle: string;
  note?: string | null;
  renderEdit: (onSaved: (message: string) => void) => React.ReactNode;
}) {
  const notify = useContext(NoticeContext);
  const [editing, setEditing] = useState(false);
  const [, removeAction] = useActionState<ActionResult | null, FormData>(async (previous, formData) => {
    const result = await remove(previous, formData);
    notify(result.ok ? { ok: true, text: result.message ?? `${name} deleted.` } : { ok: false, text: result.formError ?? `${name} could not be deleted.` });
    return result;
  }, null);
  const onSaved = useCallback(
    (message: string) => {
      setEditing(false);
      notify({ ok: true, text: message });
    },
    [notify],
  );
  return (
    <div className="flex flex-nowrap justify-end gap-1 whitespace-nowrap">
      <Button type="button" variant="ghost" onClick={() => setEditing(true)}>
        Edit<span className="sr-only"> {name}</span>
      </Button>
      <form
        action={removeAction}
        onSubmit={(e) => {
          if (!window.confirm(`Delete ${name}? This cannot be undone.`)) e.preventDefault();
        }}
      >
        <input type="hidden" name={idField} value={id} />
        <SubmitButton variant="ghost" pendingText="Deleting…">
          Delete<span className="sr-only"> {name}</span>
        </SubmitButton>
      </form>
      {editing && (
        <Dialog title={editTitle} onClose={() => setEditing(false)}>
          {note && <p className="rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-sm">{note}</p>}
          {renderEdit(onSaved)}
        </Dialog>
      )}
    </div>
  );
}

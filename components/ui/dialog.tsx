"use client";
import { useEffect, useId, useRef } from "react";
import { Button } from "./button";

/**
 * A modal built on the native <dialog>: the browser traps focus, Escape closes it and focus returns to
 * the button that opened it. Mount it to open it; `onClose` runs however it was closed.
 */
export function Dialog({ title, onClose, children, closeLabel = "Close" }: { title: string; onClose: () => void; children: React.ReactNode; closeLabel?: string }) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  // No close() on cleanup: its close event would unmount the dialog again when React re-runs effects,
  // and removing the element from the page already takes it out of the modal layer.
  useEffect(() => {
    const dialog = ref.current;
    if (dialog && !dialog.open) dialog.showModal();
  }, []);
  return (
    <dialog
      ref={ref}
      onClose={onClose}
      aria-labelledby={titleId}
      className="m-auto max-h-[calc(100dvh-2rem)] whitespace-normal w-[min(42rem,calc(100vw-1.5rem))] overflow-y-auto rounded-xl border border-husk-200 bg-white p-0 text-loam-900 shadow-xl backdrop:bg-loam-900/50"
    >
      <div className="space-y-3 p-5">
        <div className="flex items-start justify-between gap-3">
          <h2 id={titleId} className="text-lg font-bold">
            {title}
          </h2>
          <Button type="button" variant="ghost" onClick={() => ref.current?.close()}>
            {closeLabel}
          </Button>
        </div>
        {children}
      </div>
    </dialog>
  );
}

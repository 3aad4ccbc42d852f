"use client";
import { useState, type ReactNode } from "react";

/**
 * A <details> whose body is rendered only once opened. A trial of 50 sites has 50 per-site tables of 40
 * entries and 2,000 per-site emergence rows; rendering them closed made the page megabytes of HTML.
 */
export function LazyDetails({ summary, children, className, summaryClassName, defaultOpen = false }: { summary: ReactNode; children: ReactNode; className?: string; summaryClassName?: string; defaultOpen?: boolean }) {
  const [open, setOpen] = useState(defaultOpen);
  // Opens itself when it becomes the only section (e.g. every other site unticked), as a plain <details open> would.
  const [wasDefaultOpen, setWasDefaultOpen] = useState(defaultOpen);
  if (defaultOpen !== wasDefaultOpen) {
    setWasDefaultOpen(defaultOpen);
    if (defaultOpen) setOpen(true);
  }
  return (
    <details className={className} open={open} onToggle={(e) => setOpen(e.currentTarget.open)}>
      <summary className={summaryClassName}>{summary}</summary>
      {open && children}
    </details>
  );
}

"use client";
import { Button } from "./button";

export function PrintButton({ children = "Print this page" }: { children?: React.ReactNode }) {
  return (
    <Button type="button" variant="secondary" onClick={() => window.print()} className="no-print">
      {children}
    </Button>
  );
}

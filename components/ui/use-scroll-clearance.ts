"use client";
import { useEffect, useRef } from "react";

// Browsers bring a focused field or an anchor into view against the screen's top edge, so a bar stuck
// there would cover it. The page's scroll-padding-top (app/globals.css) follows the bar's height, which
// changes with what it shows (status lines, a fill button), so the field lands just below the bar.
const GAP_PX = 8;

/** Attach the returned ref to a bar stuck to the top of the screen (`sticky top-0`); one such bar per page. */
export function useScrollClearance<T extends HTMLElement>() {
  const ref = useRef<T>(null);
  useEffect(() => {
    const bar = ref.current;
    if (!bar) return;
    const root = document.documentElement;
    const observer = new ResizeObserver(() => root.style.setProperty("--sticky-bar-height", `${bar.offsetHeight + GAP_PX}px`));
    observer.observe(bar);
    return () => {
      observer.disconnect();
      root.style.removeProperty("--sticky-bar-height");
    };
  }, []);
  return ref;
}

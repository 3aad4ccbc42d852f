"use client";
import { useEffect, useRef, useState } from "react";
import * as Plot from "@observablehq/plot";
import { useLocale, useTranslations } from "next-intl";

/**
 * An Observable Plot chart that redraws at the width of its container (phone or desktop). The chart
 * itself is hidden from screen readers; `summary` is its text alternative, read instead of the SVG,
 * and `children` can add a data table for everyone.
 */
export function Chart({
  title,
  summary,
  build,
  height = 320,
  testId,
  children,
}: {
  title: string;
  summary: string;
  build: (width: number) => Plot.PlotOptions;
  height?: number;
  testId?: string;
  children?: React.ReactNode;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);
  const locale = useLocale();

  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const observer = new ResizeObserver(([entry]) => setWidth(Math.floor(entry!.contentRect.width)));
    observer.observe(el);
    return () => observer.disconnect();
  }, []);

  useEffect(() => {
    const el = box.current;
    if (!el || width === 0) return;
    const options = build(width);
    const chart = Plot.plot({ height, style: { fontSize: width < 500 ? "11px" : "13px", background: "transparent" }, ...(locale === "en" ? options : withNumberTicksIn(locale, options)), width });
    chart.setAttribute("aria-hidden", "true");
    el.append(chart);
    return () => chart.remove();
  }, [build, width, height, locale]);

  const t = useTranslations("frame");
  return (
    <figure className="space-y-2" data-testid={testId}>
      <figcaption className="font-semibold text-loam-900">{title}</figcaption>
      <div ref={box} className="w-full overflow-hidden" style={{ minHeight: height }} />
      <p className="text-sm text-loam-700" data-chart-summary>
        <span className="sr-only">{t("chartDescription")}</span>
        {summary}
      </p>
      {children}
    </figure>
  );
}

/** Number ticks in the page's language ("19,5" in Spanish); a scale's own tick format, and names on a band scale, stay as they are. */
function withNumberTicksIn(locale: string, options: Plot.PlotOptions): Plot.PlotOptions {
  const tick = (d: unknown) => (typeof d === "number" ? d.toLocaleString(locale) : String(d));
  const scale = (s: Plot.ScaleOptions | undefined): Plot.ScaleOptions => (s?.tickFormat !== undefined ? s : { ...s, tickFormat: tick });
  return { ...options, x: scale(options.x), y: scale(options.y) };
}

import { cn } from "@/components/ui/cn";
import type { Tone } from "@/lib/domain/vocabulary/statuses";

export type BadgeTone = Tone;

const TONES: Record<BadgeTone, string> = {
  neutral: "bg-husk-100 text-loam-900 border-husk-400",
  good: "bg-sprout-50 text-sprout-700 border-sprout-300",
  warn: "bg-marigold-100 text-marigold-800 border-marigold-400",
  bad: "bg-beet-50 text-beet-700 border-beet-600",
  info: "bg-sky-100 text-sky-800 border-sky-600",
};

export function Badge({ tone = "neutral", children }: { tone?: BadgeTone; children: React.ReactNode }) {
  return <span className={cn("inline-flex items-center rounded-full border px-2.5 py-0.5 text-xs font-semibold", TONES[tone])}>{children}</span>;
}

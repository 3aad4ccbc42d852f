import type { ButtonHTMLAttributes } from "react";
import { cn } from "@/components/ui/cn";

export type ButtonVariant = "primary" | "secondary" | "danger" | "ghost";

const VARIANTS: Record<ButtonVariant, string> = {
  primary: "bg-sprout-600 text-white hover:bg-sprout-700 disabled:bg-loam-300",
  secondary: "bg-white text-loam-900 border border-loam-300 hover:bg-husk-100 disabled:text-loam-300",
  danger: "bg-beet-600 text-white hover:bg-beet-700 disabled:bg-loam-300",
  ghost: "text-loam-700 hover:bg-husk-100",
};

export function buttonClasses(variant: ButtonVariant = "primary", extra?: string) {
  return cn(
    "inline-flex min-h-11 items-center justify-center gap-2 rounded-lg px-4 py-2 text-base font-semibold no-underline transition-colors disabled:cursor-not-allowed",
    VARIANTS[variant],
    extra,
  );
}

export function Button({ variant = "primary", className, ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: ButtonVariant }) {
  return <button className={buttonClasses(variant, className)} {...props} />;
}

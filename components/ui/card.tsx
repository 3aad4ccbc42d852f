import { cn } from "@/components/ui/cn";

export function Card({ title, children, className, actions }: { title?: string; children: React.ReactNode; className?: string; actions?: React.ReactNode }) {
  return (
    <section className={cn("rounded-xl border border-husk-200 bg-white p-5 shadow-sm", className)}>
      {(title || actions) && (
        <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
          {title && <h2 className="text-lg font-bold text-loam-900">{title}</h2>}
          {actions}
        </div>
      )}
      {children}
    </section>
  );
}

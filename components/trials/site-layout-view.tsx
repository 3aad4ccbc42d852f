import type { LayoutPlot } from "@/db/queries/trials";
import type { PlotUnit } from "@/lib/domain/vocabulary/enums";
import { cn } from "@/components/ui/cn";
import type { Caution } from "@/lib/domain/design/cautions";

const shade = (block: number) => (block % 2 === 0 ? "bg-husk-100" : "bg-white");

function groupBy<T, K>(items: T[], key: (t: T) => K): [K, T[]][] {
  const m = new Map<K, T[]>();
  for (const i of items) m.set(key(i), [...(m.get(key(i)) ?? []), i]);
  return [...m];
}

/** The map's words in the reader's language; staff screens use the English ones. */
export interface SiteMapWords {
  noLayout: string;
  block: (block: number) => string;
  flat: (tray: number) => string;
  insert: (n: number) => string;
  empty: string;
  insertOrder: string;
}

const ENGLISH: SiteMapWords = {
  noLayout: "This site has no layout yet.",
  block: (block) => `Block ${block}`,
  flat: (tray) => `Flat ${tray}`,
  insert: (n) => `Insert ${n}`,
  empty: "empty",
  insertOrder: "Inserts are numbered left to right, top row first, with the flat's long side facing you. Shading changes from block to block.",
};

/** The site's map on screen, drawn like the printed one: flats of twelve inserts, 72 cells, or bed rows. */
export function SiteMap({ layout, words = ENGLISH }: { layout: { plots: LayoutPlot[]; plotUnit: PlotUnit; plotSize: number }; words?: SiteMapWords }) {
  if (layout.plots.length === 0) return <p className="text-loam-700">{words.noLayout}</p>;
  if (layout.plotUnit === "bed_row") {
    return (
      <div className="space-y-4">
        {groupBy(layout.plots, (p) => p.block).map(([block, plots]) => (
          <section key={block} className="break-inside-avoid">
            <h3 className="font-semibold">{words.block(block)}</h3>
            <ol className="mt-1 flex flex-wrap gap-1">
              {plots.map((p) => (
                <li key={p.id} className={cn("w-24 rounded border border-sprout-700 p-2", shade(block))}>
                  <span className="block text-xs text-loam-700">#{p.position}</span>
                  <span className="block font-mono text-xl font-bold">{p.blindCode}</span>
                  <span className="block text-xs">{p.plotCode}</span>
                </li>
              ))}
            </ol>
          </section>
        ))}
      </div>
    );
  }
  const cellsPerPlot = layout.plotUnit === "insert" ? 6 : layout.plotSize;
  return (
    <div className="space-y-6">
      {groupBy(layout.plots, (p) => p.tray ?? 0).map(([tray, plots]) => {
        const slots = layout.plotUnit === "insert" ? 12 : 72;
        const owner = new Map<number, (typeof plots)[number]>();
        for (const p of plots) {
          if (layout.plotUnit === "insert") owner.set(p.traySlot ?? 0, p);
          else for (let c = p.traySlot ?? 1; c < (p.traySlot ?? 1) + cellsPerPlot; c += 1) owner.set(c, p);
        }
        return (
          <section key={tray} className="break-inside-avoid" aria-label={words.flat(tray)}>
            <h3 className="font-semibold">{words.flat(tray)}</h3>
            <ol className={cn("mt-1 grid max-w-3xl gap-px border-2 border-sprout-700 bg-loam-300", layout.plotUnit === "insert" ? "grid-cols-4" : "grid-cols-12")}>
              {Array.from({ length: slots }, (_, i) => {
                const p = owner.get(i + 1);
                return (
                  <li key={i} className={cn("min-h-12 p-1", p ? shade(p.block) : "bg-white")}>
                    <span className="block text-[10px] text-loam-700">{layout.plotUnit === "insert" ? words.insert(i + 1) : i + 1}</span>
                    {p ? (
                      <>
                        <span className={cn("block font-mono font-bold", layout.plotUnit === "insert" ? "text-xl" : "text-xs")}>{p.blindCode}</span>
                        {layout.plotUnit === "insert" && (
                          <span className="block text-xs">
                            {p.plotCode} · B{p.block}
                          </span>
                        )}
                      </>
                    ) : (
                      <span className="block text-xs text-loam-500">{words.empty}</span>
                    )}
                  </li>
                );
              })}
            </ol>
          </section>
        );
      })}
      <p className="text-sm text-loam-700">{words.insertOrder}</p>
    </div>
  );
}

export function CautionList({ cautions }: { cautions: Caution[] }) {
  return (
    <ul className="space-y-2 text-sm">
      {cautions.map((c) => (
        <li key={c.title}>
          <span className="font-semibold">{c.title}: </span>
          {c.text}
        </li>
      ))}
    </ul>
  );
}

import { renderToBuffer } from "@react-pdf/renderer";
import type { SiteSheetData } from "./shared/sheet-data";
import { TrayMapDocument } from "./tray-map/document";
import { PlotLabelsDocument } from "./plot-labels/document";
import { FieldSheetDocument } from "./field-sheet/document";
import { PackingListDocument } from "./packing-list/document";

export type SheetKind = "map" | "labels" | "sheet" | "packing";

export const SHEET_FILE_NAMES: Record<SheetKind, string> = { map: "tray-map", labels: "plot-labels", sheet: "field-sheet", packing: "packing-list" };

/** Renders one site printable to PDF bytes. */
export async function renderSiteSheet(kind: SheetKind, data: SiteSheetData): Promise<Buffer> {
  const doc =
    kind === "map" ? (
      <TrayMapDocument data={data} />
    ) : kind === "labels" ? (
      <PlotLabelsDocument data={data} />
    ) : kind === "packing" ? (
      <PackingListDocument data={data} />
    ) : (
      <FieldSheetDocument data={data} />
    );
  return renderToBuffer(doc);
}

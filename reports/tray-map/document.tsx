import { Document, Page, Text, View } from "@react-pdf/renderer";
import type { SheetPlot, SiteSheetData } from "../shared/sheet-data";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { ACCENT, base, Cautions, Footer, Protocol, RULE, SHADE, SheetHeader, TREATED_INK, registerFonts } from "../shared/pdf";

// A 1020 flat seen from above, long side left to right: 4 inserts along, 3 across (12 six-cell inserts);
// a 72-cell view is 12 cells along and 6 across.
const INSERTS_ALONG = 4;
const CELL_COLS = 12;

const blockShade = (block: number) => (block % 2 === 0 ? SHADE : "#ffffff");

function groupBy<T, K>(items: T[], key: (t: T) => K): Map<K, T[]> {
  const m = new Map<K, T[]>();
  for (const i of items) m.set(key(i), [...(m.get(key(i)) ?? []), i]);
  return m;
}

function InsertFlat({ tray, plots, t }: { tray: number; plots: SheetPlot[]; t: Translator }) {
  const bySlot = new Map(plots.map((p) => [p.traySlot ?? 0, p]));
  return (
    <View wrap={false} style={{ marginBottom: 10 }}>
      <Text style={{ fontWeight: 700, marginBottom: 3 }}>{t("sheets.flat", { tray: String(tray) })}</Text>
      <View style={{ borderWidth: 2, borderColor: ACCENT, flexDirection: "row", flexWrap: "wrap", width: INSERTS_ALONG * 128 + 4 }}>
        {Array.from({ length: 12 }, (_, i) => {
          const p = bySlot.get(i + 1);
          return (
            <View key={i} style={{ width: 128, height: 64, borderWidth: 0.5, borderColor: RULE, padding: 4, backgroundColor: p ? blockShade(p.block) : "#ffffff" }}>
              <Text style={{ fontSize: 7, color: "#4f6446" }}>{t("sheets.insert", { n: String(i + 1) })}</Text>
              {p ? (
                <>
                  <Text style={{ fontSize: 18, fontWeight: 700, letterSpacing: 1 }}>{p.blindCode}</Text>
                  <Text style={{ fontSize: 7.5 }}>
                    {t("sheets.plotBlock", { plot: p.plotCode, block: String(p.block) })}
                    {p.treated ? " · " : ""}
                    {p.treated ? <Text style={{ fontWeight: 700, color: TREATED_INK }}>{t("sheets.treated")}</Text> : null}
                  </Text>
                </>
              ) : (
                <Text style={{ fontSize: 8, color: "#4f6446", marginTop: 10 }}>{t("sheets.empty")}</Text>
              )}
            </View>
          );
        })}
      </View>
      <Text style={{ fontSize: 7, color: "#4f6446", marginTop: 2 }}>{t("sheets.insertOrder")}</Text>
    </View>
  );
}

function CellFlat({ tray, plots, cellsPerPlot, t }: { tray: number; plots: SheetPlot[]; cellsPerPlot: number; t: Translator }) {
  // Cell plots are stored by their first cell; the plot fills the cells that follow it.
  const owner = new Map<number, SheetPlot>();
  for (const p of plots) for (let c = p.traySlot ?? 1; c < (p.traySlot ?? 1) + cellsPerPlot; c += 1) owner.set(c, p);
  return (
    <View wrap={false} style={{ marginBottom: 10 }}>
      <Text style={{ fontWeight: 700, marginBottom: 3 }}>{t("sheets.flatCells", { tray: String(tray) })}</Text>
      <View style={{ borderWidth: 2, borderColor: ACCENT, flexDirection: "row", flexWrap: "wrap", width: CELL_COLS * 44 + 4 }}>
        {Array.from({ length: 72 }, (_, i) => {
          const p = owner.get(i + 1);
          return (
            <View key={i} style={{ width: 44, height: 30, borderWidth: 0.5, borderColor: RULE, padding: 2, backgroundColor: p ? blockShade(p.block) : "#ffffff" }}>
              <Text style={{ fontSize: 6, color: "#4f6446" }}>{i + 1}</Text>
              <Text style={{ fontSize: 9, fontWeight: 700 }}>{p?.blindCode ?? ""}</Text>
              {p?.treated ? <Text style={{ fontSize: 5.5, fontWeight: 700, color: TREATED_INK }}>{t("sheets.treated")}</Text> : null}
            </View>
          );
        })}
      </View>
    </View>
  );
}

function BedRows({ plots, t }: { plots: SheetPlot[]; t: Translator }) {
  return (
    <View>
      {[...groupBy(plots, (p) => p.block)].map(([block, inBlock]) => (
        <View key={block} wrap={false} style={{ marginBottom: 8 }}>
          <Text style={{ fontWeight: 700, marginBottom: 3 }}>{t("sheets.bedBlock", { block: String(block) })}</Text>
          <View style={{ flexDirection: "row", flexWrap: "wrap" }}>
            {inBlock.map((p) => (
              <View key={p.id} style={{ width: 78, height: 46, borderWidth: 1, borderColor: ACCENT, marginRight: 3, marginBottom: 3, padding: 3, backgroundColor: blockShade(block) }}>
                <Text style={{ fontSize: 7, color: "#4f6446" }}>#{p.position}</Text>
                <Text style={{ fontSize: 15, fontWeight: 700 }}>{p.blindCode}</Text>
                <Text style={{ fontSize: 7 }}>
                  {p.plotCode}
                  {p.treated ? <Text style={{ fontWeight: 700, color: TREATED_INK }}> {t("sheets.treated")}</Text> : null}
                </Text>
              </View>
            ))}
          </View>
        </View>
      ))}
    </View>
  );
}

/** Where each coded entry goes at one site: flats for tray trials, blocks of bed rows for field trials. */
export function TrayMapDocument({ data }: { data: SiteSheetData }) {
  registerFonts();
  const trays = [...groupBy(data.plots.filter((p) => p.tray !== null), (p) => p.tray!)];
  const t = translatorFor(data.locale);
  const title = data.plotUnit === "bed_row" ? t("sheets.fieldMap") : t("sheets.trayMap");
  return (
    <Document title={`${title} – ${data.trialCode} – ${data.siteName}`} author="Seedplot" language={data.locale}>
      <Page size={data.pageSize} orientation="landscape" style={base.page}>
        <SheetHeader data={data} title={title} />
        {data.plots.length === 0 ? (
          <Text>{t("sheets.noLayout")}</Text>
        ) : data.plotUnit === "bed_row" ? (
          <BedRows plots={data.plots} t={t} />
        ) : (
          trays.map(([tray, plots]) =>
            data.plotUnit === "insert" ? <InsertFlat key={tray} tray={tray} plots={plots} t={t} /> : <CellFlat key={tray} tray={tray} plots={plots} cellsPerPlot={data.plotSize} t={t} />,
          )
        )}
        <Text style={{ fontSize: 7.5, marginTop: 2 }}>
          {t("sheets.mapHelp")}
          {data.plots.some((p) => p.treated) ? t("sheets.mapTreated") : ""}
        </Text>
        <Protocol data={data} />
        <Cautions data={data} />
        <Footer data={data} />
      </Page>
    </Document>
  );
}

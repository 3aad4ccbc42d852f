import { Document, Page, Text, View } from "@react-pdf/renderer";
import type { SiteSheetData } from "../shared/sheet-data";
import { base, Cautions, Footer, RULE, SHADE, SheetHeader, registerFonts } from "../shared/pdf";
import { MIN_SPARE_SEEDS, SPARE_SHARE } from "@/lib/domain/design/kits";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

const COLUMNS = [
  // Wide enough for the longer Spanish headings ("Empacado", "Semillas por parcela").
  { label: "sheets.colPacked", width: 56 },
  { label: "sheets.colCode", width: 50 },
  { label: "sheets.colLot", width: 158 },
  { label: "sheets.colTreated", width: 54 },
  { label: "sheets.colPlots", width: 46 },
  { label: "sheets.colSeedsPerPlot", width: 62 },
  { label: "sheets.colSpares", width: 50 },
  { label: "sheets.colSeedsToCount", width: 62 },
] as const;

/** The packer's list for one site's kit: each blind code, its lot, treated or not, and how many seeds to count. */
export function PackingListDocument({ data }: { data: SiteSheetData }) {
  registerFonts();
  const total = data.packing.reduce((sum, r) => sum + r.seedsToCount, 0);
  const t = translatorFor(data.locale);
  return (
    <Document title={`${t("sheets.packingTitle")} – ${data.trialCode} – ${data.siteName}`} author="Seedplot" language={data.locale}>
      <Page size={data.pageSize} style={base.page}>
        <SheetHeader data={data} title={t("sheets.packingTitle")} />
        <Text style={{ marginBottom: 6 }}>{t("sheets.packingHelp", { share: String(Math.round(SPARE_SHARE * 100)), min: String(MIN_SPARE_SEEDS) })}</Text>
        <View style={{ flexDirection: "row", borderBottomWidth: 1, borderColor: RULE, paddingBottom: 2 }} fixed>
          {COLUMNS.map((c) => (
            <Text key={c.label} style={{ width: c.width, fontWeight: 700 }}>
              {t(c.label)}
            </Text>
          ))}
        </View>
        {data.packing.map((r, i) => (
          <View key={r.blindCode} wrap={false} style={{ flexDirection: "row", paddingVertical: 4, borderBottomWidth: 0.5, borderColor: RULE, backgroundColor: i % 2 ? SHADE : "#ffffff" }}>
            <Text style={{ width: COLUMNS[0].width }}>[   ]</Text>
            <Text style={{ width: COLUMNS[1].width, fontWeight: 700 }}>{r.blindCode}</Text>
            <Text style={{ width: COLUMNS[2].width }}>{r.lot ?? t("sheets.noLot")}</Text>
            <Text style={{ width: COLUMNS[3].width, fontWeight: r.treated ? 700 : 400 }}>{r.treated ? t("sheets.treated") : t("sheets.untreated")}</Text>
            <Text style={{ width: COLUMNS[4].width }}>{r.plots}</Text>
            <Text style={{ width: COLUMNS[5].width }}>{r.seedsPerPlot}</Text>
            <Text style={{ width: COLUMNS[6].width }}>{r.spares}</Text>
            <Text style={{ width: COLUMNS[7].width, fontWeight: 700 }}>{r.seedsToCount}</Text>
          </View>
        ))}
        <Text style={{ marginTop: 6, fontWeight: 600 }}>
          {t("sheets.packingTotal", { packets: String(data.packing.length), seeds: total.toLocaleString(data.locale === "en" ? "en-US" : data.locale) })}
        </Text>
        <Cautions data={data} />
        <Footer data={data} />
      </Page>
    </Document>
  );
}

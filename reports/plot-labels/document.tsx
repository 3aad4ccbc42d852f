import { Document, Image, Page, Text, View } from "@react-pdf/renderer";
import type { SiteSheetData } from "../shared/sheet-data";
import { plotPlace } from "@/lib/domain/design/site-layout";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { ACCENT, RULE, TREATED_INK, base, registerFonts } from "../shared/pdf";

// Three labels across, cut along the dashed lines; each carries only what a grower needs at the plot:
// plot id, blind code, block and a QR code for the plot's page (no variety names).
const PER_ROW = 3;

/** Plot labels for one site, one per plot, in layout order. */
export function PlotLabelsDocument({ data }: { data: SiteSheetData }) {
  registerFonts();
  const t = translatorFor(data.locale);
  return (
    <Document title={`${t("sheets.labels")} – ${data.trialCode} – ${data.siteName}`} author="Seedplot" language={data.locale}>
      <Page size={data.pageSize} style={{ ...base.page, padding: 24 }}>
        <Text style={{ fontSize: 8, color: "#4f6446", marginBottom: 6 }} fixed>
          {t("sheets.labelsHeader", { trial: data.trialTitle, code: data.trialCode, site: data.siteName })}
        </Text>
        <View style={{ flexDirection: "row", flexWrap: "wrap" }}>
          {data.plots.map((p) => (
            <View
              key={p.id}
              wrap={false}
              style={{ width: `${100 / PER_ROW}%`, height: 104, borderWidth: 0.75, borderStyle: "dashed", borderColor: RULE, padding: 6, flexDirection: "row" }}
            >
              <View style={{ flexGrow: 1, flexShrink: 1, justifyContent: "space-between" }}>
                <View>
                  <Text style={{ fontSize: 7, color: "#4f6446" }}>{data.trialCode}</Text>
                  <Text style={{ fontSize: 24, fontWeight: 700, color: ACCENT, letterSpacing: 1.5 }}>{p.blindCode}</Text>
                  {p.treated ? <Text style={{ fontSize: 7.5, fontWeight: 700, color: TREATED_INK }}>{t("sheets.treatedLabel")}</Text> : null}
                </View>
                <View>
                  <Text style={{ fontSize: 9, fontWeight: 600 }}>{t("sheets.plot", { plot: p.plotCode })}</Text>
                  <Text style={{ fontSize: 8 }}>
                    {t("sheets.block", { block: String(p.block) })}
                    {` · ${plotPlace(data.plotUnit, p, data.plotSize, t)}`}
                  </Text>
                </View>
              </View>
              {data.qrCodes?.[p.id] ? <Image src={data.qrCodes[p.id]!} style={{ width: 72, height: 72, alignSelf: "center" }} /> : null}
            </View>
          ))}
        </View>
      </Page>
    </Document>
  );
}

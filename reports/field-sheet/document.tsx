import { Document, Page, Text, View } from "@react-pdf/renderer";
import type { SiteSheetData } from "../shared/sheet-data";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { base, Cautions, Footer, Protocol, RULE, SHADE, SheetHeader, registerFonts } from "../shared/pdf";

// Enough writing room per value on a clipboard; more columns go on a following table.
const COLUMNS_PER_TABLE = 6;

function chunk<T>(items: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out.length ? out : [[]];
}

const cell = { borderRightWidth: 0.75, borderColor: RULE, padding: 3 } as const;

/** The field data sheet: every plot of the site with a box for each trait on each due date. */
export function FieldSheetDocument({ data }: { data: SiteSheetData }) {
  registerFonts();
  const groups = chunk(data.columns, COLUMNS_PER_TABLE);
  const t = translatorFor(data.locale);
  return (
    <Document title={`${t("sheets.fieldSheet")} – ${data.trialCode} – ${data.siteName}`} author="Seedplot" language={data.locale}>
      <Page size={data.pageSize} orientation="landscape" style={base.page}>
        <SheetHeader data={data} title={t("sheets.fieldSheet")} />
        <Text style={{ marginBottom: 4 }}>{t("sheets.fieldSheetHelp")}</Text>
        {groups.map((cols, g) => (
          <View key={g} style={{ marginBottom: 10 }} break={g > 0}>
            {g > 0 ? <SheetHeader data={data} title={t("sheets.fieldSheetContinued", { part: String(g + 1), parts: String(groups.length) })} /> : null}
            <View style={{ flexDirection: "row", borderWidth: 0.75, borderColor: RULE, backgroundColor: SHADE }} fixed>
              <Text style={{ ...cell, width: 62, fontWeight: 700 }}>{t("sheets.colPlot")}</Text>
              <Text style={{ ...cell, width: 36, fontWeight: 700 }}>{t("sheets.colBlock")}</Text>
              <Text style={{ ...cell, width: 40, fontWeight: 700 }}>{t("sheets.colCode")}</Text>
              {cols.map((c, i) => (
                <View key={i} style={{ ...cell, flex: 1 }}>
                  <Text style={{ fontWeight: 700 }}>{c.heading}</Text>
                  <Text style={{ fontSize: 7 }}>{c.when}</Text>
                </View>
              ))}
            </View>
            {data.plots.map((p) => (
              <View key={p.id} wrap={false} style={{ flexDirection: "row", borderWidth: 0.75, borderTopWidth: 0, borderColor: RULE, minHeight: 20, backgroundColor: p.block % 2 === 0 ? SHADE : "#ffffff" }}>
                <Text style={{ ...cell, width: 62 }}>{p.plotCode}</Text>
                <Text style={{ ...cell, width: 36 }}>{p.block}</Text>
                <Text style={{ ...cell, width: 40, fontWeight: 700 }}>{p.blindCode}</Text>
                {cols.map((_, i) => (
                  <View key={i} style={{ ...cell, flex: 1, minHeight: 20 }} />
                ))}
              </View>
            ))}
          </View>
        ))}
        <Protocol data={data} />
        <Cautions data={data} />
        <Footer data={data} />
      </Page>
    </Document>
  );
}

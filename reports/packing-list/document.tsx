import { Document, Page, Text, View } from "@react-pdf/renderer";
import type { SiteSheetData } from "../shared/sheet-data";
import { base, Cautions, Footer, RULE, SHADE, SheetHeader, registerFonts } from "../shared/pdf";
import { MIN_SPARE_SEEDS, SPARE_SHARE } from "@/lib/domain/design/kits";

const COLUMNS = [
  { label: "Packed", width: 44 },
  { label: "Code", width: 56 },
  { label: "Seed lot", width: 170 },
  { label: "Treated", width: 58 },
  { label: "Plots", width: 36 },
  { label: "Seeds per plot", width: 58 },
  { label: "Spares", width: 42 },
  { label: "Seeds to count", width: 60 },
] as const;

/** The packer's list for one site's kit: each blind code, its lot, treated or not, and how many seeds to count. */
export function PackingListDocument({ data }: { data: SiteSheetData }) {
  registerFonts();
  const total = data.packing.reduce((sum, r) => sum + r.seedsToCount, 0);
  return (
    <Document title={`Packing list – ${data.trialCode} – ${data.siteName}`} author="Seedplot">
      <Page size={data.pageSize} style={base.page}>
        <SheetHeader data={data} title="Seed kit packing list" />
        <Text style={{ marginBottom: 6 }}>
          Count the seeds for each code into a packet marked with the code only (never the variety name), tick Packed, and pack treated
          packets in a separate bag marked TREATED. Seeds to count include {Math.round(SPARE_SHARE * 100)}% spare (at least {MIN_SPARE_SEEDS} seeds) for
          gaps.
        </Text>
        <View style={{ flexDirection: "row", borderBottomWidth: 1, borderColor: RULE, paddingBottom: 2 }} fixed>
          {COLUMNS.map((c) => (
            <Text key={c.label} style={{ width: c.width, fontWeight: 700 }}>
              {c.label}
            </Text>
          ))}
        </View>
        {data.packing.map((r, i) => (
          <View key={r.blindCode} wrap={false} style={{ flexDirection: "row", paddingVertical: 4, borderBottomWidth: 0.5, borderColor: RULE, backgroundColor: i % 2 ? SHADE : "#ffffff" }}>
            <Text style={{ width: COLUMNS[0].width }}>[   ]</Text>
            <Text style={{ width: COLUMNS[1].width, fontWeight: 700 }}>{r.blindCode}</Text>
            <Text style={{ width: COLUMNS[2].width }}>{r.lot ?? "no lot chosen yet"}</Text>
            <Text style={{ width: COLUMNS[3].width, fontWeight: r.treated ? 700 : 400 }}>{r.treated ? "TREATED" : "untreated"}</Text>
            <Text style={{ width: COLUMNS[4].width }}>{r.plots}</Text>
            <Text style={{ width: COLUMNS[5].width }}>{r.seedsPerPlot}</Text>
            <Text style={{ width: COLUMNS[6].width }}>{r.spares}</Text>
            <Text style={{ width: COLUMNS[7].width, fontWeight: 700 }}>{r.seedsToCount}</Text>
          </View>
        ))}
        <Text style={{ marginTop: 6, fontWeight: 600 }}>
          {data.packing.length} packets, {total.toLocaleString("en-US")} seeds in all. Packed by: ____________________ on ____________
        </Text>
        <Cautions data={data} />
        <Footer data={data} />
      </Page>
    </Document>
  );
}

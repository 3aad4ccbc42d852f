import { renderToBuffer } from "@react-pdf/renderer";
import { createElement } from "react";
import type { PublicSnapshot } from "@/lib/domain/publish/public-shape";
import { registerFonts } from "../shared/pdf";
import { TrialReport, type SectionPages } from "./document";

/** Renders the published report in one pass; the contents page numbers are filled during pagination. */
export async function renderTrialReport(snapshot: PublicSnapshot): Promise<Buffer> {
  registerFonts();
  const pages: SectionPages = {};
  return renderToBuffer(createElement(TrialReport, { snapshot, pages }) as Parameters<typeof renderToBuffer>[0]);
}

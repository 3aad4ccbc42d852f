import { renderToBuffer } from "@react-pdf/renderer";
import { createElement } from "react";
import type { PublishedSnapshot } from "@/lib/publish/types";
import { registerFonts } from "../shared/pdf";
import { TrialReport, type SectionPages } from "./document";

/**
 * Renders the published report. The first pass lays the document out to learn on which page each
 * section starts; the second prints those numbers in the table of contents.
 */
export async function renderTrialReport(snapshot: PublishedSnapshot): Promise<Buffer> {
  registerFonts();
  const pages: SectionPages = {};
  await renderToBuffer(createElement(TrialReport, { snapshot, pages, toc: null }) as Parameters<typeof renderToBuffer>[0]);
  return renderToBuffer(createElement(TrialReport, { snapshot, pages: null, toc: pages }) as Parameters<typeof renderToBuffer>[0]);
}

import { promises as fs } from "node:fs";
import { createRequire } from "node:module";
import type { Page } from "playwright-core";

let axeSource: string | undefined;

/**
 * Runs axe-core (the open-source accessibility rules engine) on the page as it stands and returns the
 * serious and critical violations, each with the first elements it names. The page's context needs
 * `bypassCSP: true`, since axe is injected as a script.
 */
export async function seriousAccessibilityProblems(page: Page): Promise<{ id: string; impact: string; targets: string[] }[]> {
  axeSource ??= await fs.readFile(createRequire(import.meta.url).resolve("axe-core/axe.min.js"), "utf8");
  await page.evaluate(axeSource);
  const violations = (await page.evaluate(async () => {
    // @ts-expect-error axe is injected above
    const result = await window.axe.run(document, { resultTypes: ["violations"] });
    return result.violations.map((v: { id: string; impact: string; nodes: { target: string[] }[] }) => ({
      id: v.id,
      impact: v.impact,
      targets: v.nodes.slice(0, 3).map((n) => n.target.join(" ")),
    }));
  })) as { id: string; impact: string; targets: string[] }[];
  return violations.filter((v) => v.impact === "serious" || v.impact === "critical");
}

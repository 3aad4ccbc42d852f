import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { CV_TARGET } from "@/lib/domain/analysis/format";

const root = path.resolve(import.meta.dirname, "../../..");

function sources(dir: string): string[] {
  return fs.readdirSync(path.join(root, dir), { withFileTypes: true }).flatMap((e) => {
    const rel = path.join(dir, e.name);
    if (e.isDirectory()) return sources(rel);
    return /\.tsx?$/.test(e.name) ? [rel] : [];
  });
}

describe("the CV target", () => {
  it("is written once: no page, component, report or use case spells out its figure instead of reading CV_TARGET", () => {
    // "12%" or "12 %" as a literal figure; the constant's own line says where the figure comes from.
    const literal = new RegExp(`(?<![\\d.,])${CV_TARGET}\\s?%`);
    const spelled = ["app", "components", "lib", "server", "reports"]
      .flatMap(sources)
      .filter((file) => fs.readFileSync(path.join(root, file), "utf8").split("\n").some((line) => literal.test(line) && !/export const CV_TARGET|under \d+% is "well-controlled"/.test(line)));
    expect(spelled).toEqual([]);
  });
});

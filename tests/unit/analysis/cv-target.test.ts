import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { projectRoot, sourceFiles } from "../../helpers/source-files";
import { CV_TARGET } from "@/lib/domain/analysis/format";

describe("the CV target", () => {
  it("is written once: no page, component, report or use case spells out its figure instead of reading CV_TARGET", () => {
    // "12%" or "12 %" as a literal figure; the constant's own line says where the figure comes from.
    const literal = new RegExp(`(?<![\\d.,])${CV_TARGET}\\s?%`);
    const spelled = ["app", "components", "lib", "server", "reports"]
      .flatMap(sourceFiles)
      .filter((file) => fs.readFileSync(path.join(projectRoot, file), "utf8").split("\n").some((line) => literal.test(line) && !/export const CV_TARGET|under \d+% is "well-controlled"/.test(line)));
    expect(spelled).toEqual([]);
  });
});

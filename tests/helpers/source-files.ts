import fs from "node:fs";
import path from "node:path";

/** The project's root folder, for tests that read its source files. */
export const projectRoot = path.resolve(import.meta.dirname, "../..");

/** Every .ts and .tsx file under `dir` (relative to the project root), with paths relative to the root. */
export function sourceFiles(dir: string): string[] {
  return fs.readdirSync(path.join(projectRoot, dir), { withFileTypes: true }).flatMap((e) => {
    const rel = path.join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(rel);
    return /\.tsx?$/.test(e.name) ? [rel] : [];
  });
}

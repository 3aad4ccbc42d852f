// Quantiles against published critical-value tables (tests/fixtures/tables, each row naming its
// table) and R 4.2.2's quantiles of the same rows; upper tails against R's p-values.
import { describe, expect, it } from "vitest";
import {
  chiSquareQuantile,
  chiSquareUpper,
  fQuantile,
  fUpper,
  normalQuantile,
  studentizedRangeQuantile,
  studentizedRangeUpper,
  studentTQuantile,
  studentTTwoSided,
} from "@/lib/domain/stats";
import { integrate } from "@/lib/domain/stats/integration";
import { readJson, relativeError } from "./fixtures";

const tables = readJson("tables/critical-values-0.05.json");
const halfUnit = (text: string) => 0.5 * 10 ** -(text.split(".")[1]?.length ?? 0);

describe("published 5% critical values (tables/README.md sources)", () => {
  for (const row of tables.student_t_two_sided_0_05.rows) {
    it(`Student t df ${row.params.df}: ${row.published_text} (NIST/SEMATECH e-Handbook 1.3.6.7.2)`, () => {
      const t = studentTQuantile(0.975, row.params.df);
      expect(Math.abs(t - row.published)).toBeLessThanOrEqual(halfUnit(row.published_text));
      expect(relativeError(t, row.r_value)).toBeLessThan(1e-12); // R qt
    });
  }
  for (const row of tables.chi_square_upper_0_05.rows) {
    it(`chi-square df ${row.params.df}: ${row.published_text} (StatSoft right-tail table)`, () => {
      const x = chiSquareQuantile(0.95, row.params.df);
      expect(Math.abs(x - row.published)).toBeLessThanOrEqual(halfUnit(row.published_text));
      expect(relativeError(x, row.r_value)).toBeLessThan(1e-12); // R qchisq
    });
  }
  for (const row of tables.f_upper_0_05.rows) {
    it(`F(${row.params.df1}, ${row.params.df2}): ${row.published_text} (A-level F table)`, () => {
      const f = fQuantile(0.95, row.params.df1, row.params.df2);
      expect(Math.abs(f - row.published)).toBeLessThanOrEqual(halfUnit(row.published_text));
      expect(relativeError(f, row.r_value)).toBeLessThan(1e-12); // R qf
    });
  }
  for (const row of tables.studentized_range_upper_0_05.rows) {
    it(`studentized range k ${row.params.k}, df ${row.params.df}: ${row.published_text} (HyperStat / profscm tables)`, () => {
      const q = studentizedRangeQuantile(0.95, row.params.k, row.params.df);
      expect(Math.abs(q - row.published)).toBeLessThanOrEqual(halfUnit(row.published_text));
      expect(Math.abs(q - row.r_value)).toBeLessThan(1e-4); // R qtukey's own accuracy (README)
      expect(Math.abs(studentizedRangeUpper(q, row.params.k, row.params.df) - 0.05)).toBeLessThan(1e-12);
    });
  }
});

describe("upper tails computed directly (values from the R 4.2.2 reference cases)", () => {
  it("pf(20.908, 7, 49, lower.tail = FALSE) = 1.0259e-12 (pub-03 entry F) to 1e-12 relative", () => {
    expect(relativeError(fUpper(20.90825180311086, 7, 49), 1.0259033671053024e-12)).toBeLessThan(1e-12);
  });
  it("pf(76.82, 3, 32, lower.tail = FALSE) = 1.035e-14 (pub-05 site F)", () => {
    expect(relativeError(fUpper(76.82462843730941, 3, 32), 1.0352367065387897e-14)).toBeLessThan(1e-12);
  });
  it("pchisq(91.61, 1, lower.tail = FALSE) = 1.056e-21 (pub-08 Yates chi-square)", () => {
    expect(relativeError(chiSquareUpper(91.60959785812125, 1), 1.0557968087828389e-21)).toBeLessThan(1e-12);
  });
  it("2 * pt(-5.641, 49) = 8.32e-7 (pub-03 LSD pair H-D)", () => {
    expect(relativeError(studentTTwoSided(5.641007404219315, 49), 8.321848987271784e-7)).toBeLessThan(1e-12);
  });
  it("qnorm(0.975) = 1.959963984540054 (R)", () => {
    expect(relativeError(normalQuantile(0.975), 1.959963984540054)).toBeLessThan(1e-15);
  });
  it("ptukey(|t| sqrt 2, 3, 27, upper) = 0.0120064 (pub-01 Tukey trt2-trt1)", () => {
    expect(Math.abs(studentizedRangeUpper(3.102787177917656 * Math.SQRT2, 3, 27) - 0.01200642397945273)).toBeLessThan(1e-12);
  });
});

describe("Gauss-Kronrod 15-point rule", () => {
  it("integrates x^22 exactly on one panel, and exp(-x^2/2) over [-40, 40] to sqrt(2 pi)", () => {
    expect(relativeError(integrate((x) => x ** 22, -1, 1, { maxPanels: 1 }), 2 / 23)).toBeLessThan(1e-14);
    expect(relativeError(integrate((x) => Math.exp(-0.5 * x * x), -40, 40), Math.sqrt(2 * Math.PI))).toBeLessThan(1e-13);
  });
});

// The template-count estimate that guards --template-cap must hold at every allowed match floor
// (0.5 to 0.99999), and placement itself must stop past the limit whatever the estimate said.
import { describe, expect, it } from "vitest";
import { TemplateLimitError, buildBankWithReport, psdModelByName } from "@chirpsieve/core";
import { MAX_MATCH_FLOOR, MIN_MATCH_FLOOR, estimateTemplateCount, type BuildBankOptions } from "../../packages/core/src/bank/templateBank.js";

const psd = psdModelByName("ajith2011");

/**
 * Small regions (so the densest banks place in seconds), each over the whole allowed range of match
 * floors. Count over estimate measured here: 0.58–1.47 over these and 1.2–2 M_sun from 40 Hz and
 * 5–6 M_sun from 30 Hz; the old quadratic-metric estimate fell to 1/38 of the count for 8–9 M_sun at
 * 0.99999 (and 1/500 for 8–12 M_sun), where the loss from the templates' different ISCO cutoffs,
 * linear in their separation, outweighs the quadratic metric.
 */
const cases: { massRangeSolar: [number, number]; fMinHz: number; floors: number[] }[] = [
  { massRangeSolar: [8, 9], fMinHz: 40, floors: [MIN_MATCH_FLOOR, 0.97, 0.9999, MAX_MATCH_FLOOR] },
  { massRangeSolar: [20, 25], fMinHz: 20, floors: [0.9, 0.999, 0.9999] },
  { massRangeSolar: [1.4, 1.6], fMinHz: 40, floors: [MIN_MATCH_FLOOR, 0.97, 0.999] },
];

describe("template-count estimate", () => {
  it("the allowed match floors are 0.5 to 0.99999", () => {
    expect([MIN_MATCH_FLOOR, MAX_MATCH_FLOOR]).toEqual([0.5, 0.99999]);
  });

  for (const c of cases) {
    it(`is within 0.5–2× of the placed count for ${c.massRangeSolar.join("–")} M_sun from ${c.fMinHz} Hz, match floors ${c.floors.join(", ")}`, () => {
      for (const matchFloor of c.floors) {
        const options: BuildBankOptions = { massRangeSolar: c.massRangeSolar, fMinHz: c.fMinHz, matchFloor, psd };
        const estimate = estimateTemplateCount(options);
        const { report } = buildBankWithReport(options);
        const ratio = report.templateCount / estimate;
        expect(ratio, `match floor ${matchFloor}: ${report.templateCount} placed, ${estimate.toFixed(1)} estimated`).toBeGreaterThanOrEqual(0.5);
        expect(ratio, `match floor ${matchFloor}: ${report.templateCount} placed, ${estimate.toFixed(1)} estimated`).toBeLessThanOrEqual(2);
        // The report's estimate is the guard's.
        expect(report.boundaryAwareEstimate).toBeCloseTo(estimate, 6);
      }
    });
  }

  it("refuses 8–12 M_sun from 40 Hz at 0.99999 from its estimate (~2.1e6; placement once made 2 148 404)", () => {
    const options: BuildBankOptions = { massRangeSolar: [8, 12], fMinHz: 40, matchFloor: 0.99999, psd };
    const estimate = estimateTemplateCount(options);
    expect(estimate).toBeGreaterThan(1.5e6);
    expect(estimate).toBeLessThan(3e6);
    expect(() => buildBankWithReport(options)).toThrow(TemplateLimitError);
  });

  it("placement stops past the limit when the estimate let it start (20–25 M_sun from 20 Hz at 0.5: estimate 1.4, count 2)", () => {
    const options: BuildBankOptions = { massRangeSolar: [20, 25], fMinHz: 20, matchFloor: 0.5, psd, templateCap: 1.5 };
    expect(estimateTemplateCount(options)).toBeLessThanOrEqual(1.5);
    let error: unknown;
    try {
      buildBankWithReport(options);
    } catch (err) {
      error = err;
    }
    expect(error).toBeInstanceOf(TemplateLimitError);
    expect((error as Error).message).toMatch(/placement stopped there.*limit of 1\.5/);
  });

  it("refuses match floors outside the allowed range, naming the parameter", () => {
    for (const matchFloor of [0.3, 0.999999]) {
      let error: unknown;
      try {
        estimateTemplateCount({ massRangeSolar: [8, 9], fMinHz: 40, matchFloor, psd });
      } catch (err) {
        error = err;
      }
      expect((error as { parameter?: string }).parameter).toBe("matchFloor");
    }
  });
});

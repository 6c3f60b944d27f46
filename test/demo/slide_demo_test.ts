/**
 * The demo case that starts from a slide file and a figures CSV only.
 */

import { strict as assert } from "node:assert";
import { parse } from "csv-parse/sync";
import {
  SLIDE_DEMO_ID,
  slideDemoFiguresCsv,
  writeSlideDemoCase,
} from "../../lib/demo/slide_demo.ts";
import { inAny } from "../../lib/demo/_shapes.ts";
import { loadCase } from "../../lib/annotations/read_case.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import { needsOpenSlide, tempDir } from "../slide/_fixture.ts";
import { DEMO_SEED } from "../../lib/demo/demo_cohort.ts";

Deno.test({
  name:
    "writeSlideDemoCase() gives a case read from the slide and figures alone, figures on tissue",
  ...needsOpenSlide,
  async fn() {
    const demo = writeSlideDemoCase(`${tempDir()}/slide-demo`, DEMO_SEED);
    // outside RFC 4180 reader: csv-parse 7.0.3
    const rows = parse(Deno.readTextFileSync(demo.figuresPath), { columns: true }) as {
      x: string;
      y: string;
      label: string;
    }[];
    assert.equal(rows.length, 95);
    assert.ok(rows.every((r) => inAny(demo.slide.tissue, Number(r.x), Number(r.y))));
    const caseData = await loadCase(demo.input);
    assert.equal(caseData.caseId, SLIDE_DEMO_ID);
    assert.equal(caseData.tissueSource?.slide, demo.slidePath);
    const result = buildCaseResult(caseData, { simulations: 0 });
    assert.ok(result.report.hotspot !== null && result.report.hotspot.count >= 30);
    assert.equal(result.report.figures.outside_valid, 0, "every figure lies in the found tissue");
    // the same seed writes the same figures
    assert.equal(
      slideDemoFiguresCsv(demo.slide, DEMO_SEED),
      Deno.readTextFileSync(demo.figuresPath),
    );
  },
});

/**
 * Opens written reports in headless Chromium (Debian package `chromium`) and
 * checks that the plots render, nothing errs and nothing is fetched from the
 * network; saves screenshots under test/output/.
 */

import { strict as assert } from "node:assert";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { writeOutputs } from "../../lib/report/write_outputs.ts";
import { loadCase } from "../../lib/annotations/read_case.ts";
import { buildCaseResult } from "../../lib/pipeline/build_case_result.ts";
import type { CaseResult } from "../../lib/pipeline/case_result.ts";
import { fixtureResult } from "./_fixture.ts";
import { readerAudit } from "../../lib/cohort/reader_audit.ts";
import { type BrowserPage, evaluate, hasChromium, openBrowser, waitFor } from "./_cdp.ts";

const inCi = Deno.env.get("CI") === "true";
const available = hasChromium();
if (!available && !inCi) {
  console.log(
    "browser_test.ts: /usr/bin/chromium not found, browser checks ignored. " +
      "Install it with: apt-get install -y --no-install-recommends chromium",
  );
}

const OUTPUT = resolve("test/output");

async function checkPage(
  page: BrowserPage,
  file: string,
  plots: number,
  screenshot: string,
): Promise<void> {
  page.log.errors.length = 0;
  page.log.requests.length = 0;
  await page.send("Emulation.setDeviceMetricsOverride", {
    width: 1280,
    height: 900,
    deviceScaleFactor: 1,
    mobile: false,
  });
  await page.send("Page.navigate", { url: pathToFileURL(file).href });
  const state = await waitFor(page, "document.body && document.body.dataset.plotsReady", 60000);
  assert.equal(state, "true", `plots of ${file} did not render: ${page.log.errors.join("; ")}`);
  const svgs = await evaluate(
    page,
    "document.querySelectorAll('.js-plotly-plot .main-svg').length",
  );
  assert.ok(Number(svgs) >= plots, `expected plot nodes in ${file}, found ${svgs}`);
  const drawn = await evaluate(
    page,
    "document.querySelectorAll('.js-plotly-plot').length",
  );
  assert.equal(drawn, plots, `plots drawn in ${file}`);
  assert.deepEqual(page.log.errors, [], `console errors in ${file}`);
  const offline = page.log.requests.filter((u) => !u.startsWith("file:") && !u.startsWith("data:"));
  assert.deepEqual(offline, [], `network requests from ${file}`);
  const height = Number(await evaluate(page, "document.documentElement.scrollHeight"));
  await page.send("Emulation.setDeviceMetricsOverride", {
    width: 1280,
    height: Math.min(Math.max(900, height), 8000),
    deviceScaleFactor: 1,
    mobile: false,
  });
  await new Promise((r) => setTimeout(r, 400));
  const shot = await page.send("Page.captureScreenshot", { format: "png" });
  mkdirSync(OUTPUT, { recursive: true });
  const bytes = Uint8Array.from(atob(shot.data as string), (c) => c.charCodeAt(0));
  writeFileSync(join(OUTPUT, screenshot), bytes);
  // PNG signature (ISO/IEC 15948, §5.2).
  assert.deepEqual([...bytes.slice(0, 8)], [137, 80, 78, 71, 13, 10, 26, 10]);
}

async function demoResult(name: string, scheme: string): Promise<CaseResult> {
  const caseData = await loadCase({ annotationsPath: `data/demo/${name}.geojson` });
  return buildCaseResult(caseData, { scheme, simulations: 99 });
}

Deno.test({
  name: "report.html, index.html and readers.html render their plots offline in headless Chromium",
  ignore: !available && !inCi,
  sanitizeResources: false,
  sanitizeOps: false,
  async fn() {
    assert.ok(available, "CI needs /usr/bin/chromium: apt-get install -y chromium");
    const dir = mkdtempSync(join(tmpdir(), "hotfield-browser-"));
    const page = await openBrowser();
    try {
      const results = [
        await demoResult("QVT-24-006", "canine-mct-2tier"),
        await demoResult("QVT-24-005", "canine-mct-2tier"),
        fixtureResult({ readers: ['<img src=x onerror="alert(1)">', "</script>&"] }),
      ];
      // Dated fields give their reader a plot over time on the readers page.
      results[2].report.fields[0].date = "2024-03-01";
      results[2].report.fields[1].date = "2024-04-15T09:30:00Z";
      writeOutputs(results, dir, { generatedAt: "2026-01-01T00:00:00Z" });
      await checkPage(page, join(dir, "QVT-24-006", "report.html"), 2, "report_QVT-24-006.png");
      await checkPage(page, join(dir, "QVT-24-005", "report.html"), 2, "report_QVT-24-005.png");
      await checkPage(page, join(dir, "QVT-24-901", "report.html"), 2, "report_fixture.png");
      // The hostile reader name is shown as text, never run.
      const hostile = await evaluate(
        page,
        "document.body.innerText.includes('<img src=x onerror=\"alert(1)\">')",
      );
      assert.equal(hostile, true);
      assert.equal(await evaluate(page, "document.querySelectorAll('main img').length"), 0);
      // plotly.js shows the same names literally in its legend.
      const legend = await evaluate(
        page,
        "[...document.querySelectorAll('#plot-map .legendtext')].map((t) => t.textContent)",
      ) as string[];
      assert.ok(
        legend.some((t) => t.startsWith(`<img src=x onerror="alert(1)">'s field`)),
        legend.join(" | "),
      );
      assert.ok(legend.some((t) => t.startsWith("</script>&'s field")), legend.join(" | "));
      await checkPage(page, join(dir, "index.html"), 1, "index.png");
      assert.equal(
        await evaluate(page, "document.querySelector('a[href=\"readers.html\"]') !== null"),
        true,
        "the cohort page links the readers page",
      );
      const audit = readerAudit(results.map((r) => r.report));
      const readerPlots = audit.filter((r) => r.fields > 0).length +
        audit.filter((r) => r.datedFields > 0).length;
      assert.ok(audit.some((r) => r.datedFields > 0));
      await checkPage(page, join(dir, "readers.html"), readerPlots, "readers.png");
      // Reader names render as text, in the page and in plotly's tick labels.
      assert.equal(
        await evaluate(
          page,
          "document.body.innerText.includes('Reader: <img src=x onerror=\"alert(1)\">')",
        ),
        true,
      );
      assert.equal(await evaluate(page, "document.querySelectorAll('main img').length"), 0);
      assert.equal(
        await evaluate(
          page,
          "[...document.querySelectorAll('div.plot[id$=\"-time\"]')]" +
            ".filter((d) => d.querySelector('.main-svg')).length",
        ),
        audit.filter((r) => r.datedFields > 0).length,
        "one plot over time per reader with dated fields",
      );
      // Cases whose field grade differs link to their reports.
      const links = await evaluate(
        page,
        "[...document.querySelectorAll('section.reader td a')].map((a) => a.getAttribute('href'))",
      ) as string[];
      assert.ok(links.every((h) => /^[^/]+\/report\.html$/.test(h)), links.join(" "));

      // Every kind of mark on the demo map has a legend entry, and no text sits on the map.
      await checkPage(page, join(dir, "QVT-24-006", "report.html"), 2, "report_QVT-24-006.png");
      const marks = await evaluate(
        page,
        "[...document.querySelectorAll('#plot-map .legendtext')].map((t) => t.textContent)",
      ) as string[];
      for (
        const kind of [
          /^not admissible/,
          /^tissue outline$/,
          /^tumour outline$/,
          /^excluded/,
          /^counted figures \(\d+\)$/,
          /^best \d+ separate single fields$/,
          /^top windows 2–3$/,
          /^hotspot: \d+ figures$/,
        ]
      ) {
        assert.ok(marks.some((t) => kind.test(t)), `legend entry ${kind}: ${marks.join(" | ")}`);
      }
      assert.equal(
        await evaluate(page, "document.querySelectorAll('#plot-map .textpoint').length"),
        0,
        "no text labels drawn over the map",
      );

      const alone = mkdtempSync(join(tmpdir(), "hotfield-browser-alone-"));
      writeOutputs([results[0]], alone, {
        formats: ["html"],
        standalone: true,
        generatedAt: null,
      });
      rmSync(join(alone, "assets"), { recursive: true, force: true });
      await checkPage(page, join(alone, "QVT-24-006", "report.html"), 2, "report_standalone.png");
      rmSync(alone, { recursive: true, force: true });
    } finally {
      await page.close();
      rmSync(dir, { recursive: true, force: true });
    }
  },
});

Deno.test({
  name: "a 200-case cohort page renders with sorted, non-overlapping case labels",
  ignore: !available && !inCi,
  sanitizeResources: false,
  sanitizeOps: false,
  async fn() {
    assert.ok(available, "CI needs /usr/bin/chromium: apt-get install -y chromium");
    const dir = mkdtempSync(join(tmpdir(), "hotfield-browser-200-"));
    const page = await openBrowser();
    try {
      const results: CaseResult[] = [];
      for (let i = 0; i < 200; i++) {
        const r = fixtureResult();
        // Distinct ids and counts; the engine result is shared, the report is what the page reads.
        const id = `QVT-24-${String(400 + i)}`;
        const count = (i * 37) % 61;
        results.push({
          ...r,
          prepared: { ...r.prepared, caseId: id },
          report: {
            ...r.report,
            case: id,
            hotspot: r.report.hotspot && { ...r.report.hotspot, count, per_mm2: count / 2.37 },
          },
        });
      }
      writeOutputs(results, dir, { generatedAt: "2026-01-01T00:00:00Z", formats: ["html"] });
      await checkPage(page, join(dir, "index.html"), 1, "index_200.png");
      const boxes = await evaluate(
        page,
        "[...document.querySelectorAll('#plot-cohort .ytick text')].map((t) => {" +
          " const b = t.getBoundingClientRect(); return [b.top, b.bottom, t.textContent]; })",
      ) as [number, number, string][];
      assert.equal(boxes.length, 200, "one label per case");
      boxes.sort((a, b) => a[0] - b[0]);
      for (let k = 1; k < boxes.length; k++) {
        assert.ok(
          boxes[k][0] >= boxes[k - 1][1] - 0.5,
          `labels overlap: ${boxes[k - 1][2]}, ${boxes[k][2]}`,
        );
      }
      // Highest count on top.
      assert.equal(
        boxes[0][2],
        "QVT-24-428",
        "the top label: highest count (60), first id of the tie",
      );
      // The table sorts on a click.
      await evaluate(page, "document.querySelectorAll('#cases th')[1].click()");
      const first = await evaluate(
        page,
        "document.querySelector('#cases tbody tr td:nth-child(2)').textContent",
      );
      assert.equal(first, "60", "sorted by hotspot count, highest first");
    } finally {
      await page.close();
      rmSync(dir, { recursive: true, force: true });
    }
  },
});

/**
 * Opens the comparison pages (per case and cohort) in headless Chromium
 * (Debian package `chromium`) and checks that every plot renders, nothing
 * errs, nothing is fetched from the network and input text stays text;
 * saves screenshots under test/output/.
 */

import { strict as assert } from "node:assert";
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { loadCase } from "../../lib/annotations/read_case.ts";
import { compareCase } from "../../lib/compare/compare_case.ts";
import { readCandidates } from "../../lib/compare/read_candidates.ts";
import { summarizeComparisons } from "../../lib/compare/compare_cohort.ts";
import { writeComparisonCase, writeComparisonCohort } from "../../lib/report/write_comparison.ts";
import { type BrowserPage, evaluate, hasChromium, openBrowser, waitFor } from "./_cdp.ts";

const inCi = Deno.env.get("CI") === "true";
const available = hasChromium();
const OUTPUT = resolve("test/output");
const DEMO = resolve("data/demo");

async function checkPage(page: BrowserPage, file: string, plots: number, screenshot: string) {
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
  assert.equal(await evaluate(page, "document.querySelectorAll('.js-plotly-plot').length"), plots);
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

Deno.test({
  name: "comparison.html and the cohort index.html render their plots offline in headless Chromium",
  ignore: !available && !inCi,
  sanitizeResources: false,
  sanitizeOps: false,
  async fn() {
    assert.ok(available, "CI needs /usr/bin/chromium: apt-get install -y chromium");
    const dir = mkdtempSync(join(tmpdir(), "hotfield-compare-browser-"));
    const page = await openBrowser();
    try {
      const results = [];
      for (
        const [id, det, caseId] of [
          ["QVT-24-006", "QVT-24-006.detector-missed-focus.csv", "QVT-24-006"],
          ["QVT-24-003", "QVT-24-003.detector.csv", '<img src=x onerror="alert(1)">'],
        ]
      ) {
        const reference = await loadCase({ annotationsPath: join(DEMO, `${id}.geojson`) });
        const candidates = await readCandidates(join(DEMO, "compare", det), {
          slide: reference.slide,
        });
        results.push(
          compareCase(reference, candidates, { scheme: "canine-mct-2tier", minScore: 0.5, caseId }),
        );
      }
      // A case id with markup cannot be a folder name; the cohort page still shows it as text.
      writeComparisonCase(results[0], dir, { generatedAt: "2026-01-01T00:00:00Z" });
      await checkPage(
        page,
        join(dir, "QVT-24-006", "comparison.html"),
        3,
        "comparison_QVT-24-006.png",
      );
      const legend = await evaluate(
        page,
        "[...document.querySelectorAll('#plot-map .legendtext')].map((t) => t.textContent).join('|')",
      ) as string;
      assert.ok(
        legend.includes("reference hotspot") && legend.includes("candidate hotspot"),
        legend,
      );
      assert.ok(legend.includes("(TP)") && legend.includes("(FN)"), legend);
      const jsons = results.map((r) => r.json);
      writeComparisonCohort(jsons, summarizeComparisons(jsons), [], dir, { generatedAt: null });
      await checkPage(page, join(dir, "index.html"), 2, "comparison_cohort.png");
      assert.equal(
        await evaluate(
          page,
          "document.body.innerText.includes('<img src=x onerror=\"alert(1)\">')",
        ),
        true,
      );
      assert.equal(await evaluate(page, "document.querySelectorAll('main img').length"), 0);
      const alone = mkdtempSync(join(tmpdir(), "hotfield-compare-alone-"));
      writeComparisonCase(results[0], alone, { standalone: true });
      await checkPage(
        page,
        join(alone, "QVT-24-006", "comparison.html"),
        3,
        "comparison_standalone.png",
      );
      rmSync(alone, { recursive: true, force: true });
    } finally {
      await page.close();
      rmSync(dir, { recursive: true, force: true });
    }
  },
});

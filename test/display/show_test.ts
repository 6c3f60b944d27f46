import { strict as assert } from "node:assert";
import {
  JUPYTER_DISPLAY,
  plotlyMimeBundle,
  resetPlotlyInlining,
  showCohort,
  showCountMap,
  showDistribution,
  showTable,
} from "../../lib/display/show.ts";
import { countMapFigure } from "../../lib/report/count_map_figure.ts";
import { fixtureResult } from "../report/_fixture.ts";

const FAKE = "window.Plotly={newPlot:function(){}};";

Deno.test("showCountMap() gives plotly JSON equal to the report's plot spec", () => {
  const r = fixtureResult({ standards: true });
  const b = showCountMap(r, { inlinePlotly: "never" })[JUPYTER_DISPLAY]();
  const json = b["application/vnd.plotly.v1+json"] as { data: unknown[]; layout: unknown };
  const fig = countMapFigure(r);
  assert.deepEqual(json.data, fig.data);
  assert.deepEqual(json.layout, fig.layout);
  assert.equal(b["text/plain"], fig.caption);
});

Deno.test("plotlyMimeBundle() inlines plotly.js once per session, behind a guard", () => {
  resetPlotlyInlining();
  const fig = { data: [{ type: "bar", x: [1], y: [1] }], layout: {}, caption: "" };
  const first = plotlyMimeBundle(fig, { plotlyJs: FAKE })["text/html"] as string;
  const second = plotlyMimeBundle(fig, { plotlyJs: FAKE })["text/html"] as string;
  assert.ok(first.includes(FAKE) && first.includes('if(typeof window.Plotly==="undefined")'));
  assert.ok(!second.includes(FAKE));
  const always = plotlyMimeBundle(fig, { plotlyJs: FAKE, inlinePlotly: "always" });
  assert.ok((always["text/html"] as string).includes(FAKE));
  resetPlotlyInlining();
  assert.ok((plotlyMimeBundle(fig, { plotlyJs: FAKE })["text/html"] as string).includes(FAKE));
  // Each output draws into its own element.
  const ids = [first, second].map((h) => h.match(/id="(hotfield-plot-\d+)"/)![1]);
  assert.notEqual(ids[0], ids[1]);
});

Deno.test("showDistribution() and showCohort() escape names in the HTML fallback", () => {
  const r = fixtureResult({ readers: ["</script><b>x</b>", "trainee-2"] });
  for (
    const shown of [
      showDistribution(r, { inlinePlotly: "never" }),
      showCohort([r], { inlinePlotly: "never" }),
    ]
  ) {
    const html = shown[JUPYTER_DISPLAY]()["text/html"] as string;
    assert.equal(html.match(/<\/script/gi)?.length, html.match(/<script/gi)?.length);
    assert.ok(!html.includes("<b>x</b>"));
  }
});

Deno.test("showTable() renders escaped cells and a plain-text fallback", () => {
  const b = showTable(
    [{ case: "QVT-24-001", count: 12, rate: 5.06329 }, { case: "<i>", count: 3 }],
    {
      caption: "hotspots",
    },
  )[JUPYTER_DISPLAY]();
  assert.ok((b["text/html"] as string).includes('<td style="text-align:left">&lt;i&gt;</td>'));
  assert.equal(b["text/plain"], "hotspots\ncase\tcount\trate\nQVT-24-001\t12\t5.063\n<i>\t3\t");
});

/**
 * Otsu's threshold against scikit-image's `threshold_otsu`, a general-purpose
 * image library (van der Walt et al. 2014, PeerJ 2:e453), and a hand
 * calculation. `otsuThreshold` returns the index k of the last bin of the
 * lower class; scikit-image returns the centre of that bin, which is k when
 * the bin centres are 0, 1, 2, …
 */

import { strict as assert } from "node:assert";
import { otsuThreshold } from "../../lib/tissue/otsu_threshold.ts";
import { seededRandom } from "../../lib/random.ts";

Deno.test("otsuThreshold() matches scikit-image's test image (threshold 2)", () => {
  // scikit-image's own test suite (skimage/filters/tests/test_thresholding.py,
  // TestSimpleImage.test_otsu) asserts threshold_otsu(image) == 2 for this
  // 5 × 5 image; recomputed with scikit-image 0.19.3 (Debian python3-skimage): 2.
  const image = [
    [0, 0, 1, 3, 5],
    [0, 1, 4, 3, 4],
    [1, 2, 5, 4, 1],
    [2, 4, 5, 2, 1],
    [4, 5, 1, 0, 0],
  ].flat();
  const counts = new Array(6).fill(0);
  for (const v of image) counts[v]++;
  assert.equal(otsuThreshold(counts), 2);
});

Deno.test("otsuThreshold() matches values computed with scikit-image 0.19.3", () => {
  // threshold_otsu(hist=(counts, numpy.arange(len(counts)))) with scikit-image
  // 0.19.3 (Debian python3-skimage), run on this machine: 4 and 117.
  assert.equal(otsuThreshold([2, 5, 9, 4, 1, 0, 3, 8, 12, 6, 2]), 4);
  const i = Array.from({ length: 256 }, (_, k) => k);
  const mixture = i.map((k) =>
    Math.round(
      50 + 1000 * Math.exp(-((k - 60) ** 2) / (2 * 15 ** 2)) +
        400 * Math.exp(-((k - 170) ** 2) / (2 * 25 ** 2)),
    )
  );
  assert.equal(otsuThreshold(mixture), 117);
});

Deno.test("otsuThreshold() by hand on two equal clusters", () => {
  // hand calculation: counts 3 at bin 1 and 3 at bin 4. Splits after bins
  // 1, 2 and 3 all give w0·w1·(μ0 − μ1)² = 3·3·(1 − 4)² = 81, the largest;
  // the first (after bin 1) is chosen, as numpy's argmax does.
  assert.equal(otsuThreshold([0, 3, 0, 0, 3, 0]), 1);
  // one non-empty bin: that bin, nothing above it
  assert.equal(otsuThreshold([0, 0, 7, 0]), 2);
  assert.throws(() => otsuThreshold([0, 0]), RangeError, "Cannot compute Otsu's threshold");
});

Deno.test("otsuThreshold() is unchanged when every count is scaled", () => {
  const counts = [4, 9, 2, 0, 1, 7, 11, 3];
  const k = otsuThreshold(counts);
  assert.equal(otsuThreshold(counts.map((c) => c * 1000)), k);
});

/** scikit-image's answer through Debian's python3 (null when it is not installed). */
async function skimageOtsu(histograms: number[][]): Promise<number[] | null> {
  const script = [
    "import json, sys, numpy as np",
    "from skimage.filters import threshold_otsu",
    "hs = json.load(sys.stdin)",
    "print(json.dumps([int(threshold_otsu(hist=(np.array(h), np.arange(len(h))))) for h in hs]))",
  ].join("\n");
  try {
    const child = new Deno.Command("/usr/bin/python3", {
      args: ["-c", script],
      stdin: "piped",
      stdout: "piped",
      stderr: "piped",
    }).spawn();
    const w = child.stdin.getWriter();
    await w.write(new TextEncoder().encode(JSON.stringify(histograms)));
    await w.close();
    const out = await child.output();
    if (!out.success) return null;
    return JSON.parse(new TextDecoder().decode(out.stdout));
  } catch {
    return null;
  }
}

const histograms = (() => {
  const random = seededRandom(20240601);
  const hs: number[][] = [];
  for (let t = 0; t < 40; t++) {
    const n = 8 + Math.floor(random() * 120);
    // positive first and last bins: scikit-image's formula needs both classes non-empty there
    hs.push(Array.from({ length: n }, () => 1 + Math.floor(random() * random() * 500)));
  }
  return hs;
})();
const reference = await skimageOtsu([[1, 2]]);
const inCi = Deno.env.get("CI") === "true";

Deno.test({
  name: "otsuThreshold() agrees with scikit-image on 40 seeded random histograms",
  ignore: reference === null && !inCi,
  async fn() {
    const expected = await skimageOtsu(histograms);
    assert.ok(expected !== null, "CI needs Debian's python3-skimage (.ci/run installs it)");
    assert.deepEqual(histograms.map((h) => otsuThreshold(h)), expected);
  },
});

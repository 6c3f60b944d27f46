import { strict as assert } from "node:assert";
import { canonicalJson, effectiveSettings, settingsSha256 } from "../../lib/batch/settings.ts";
import { caseProvenance, provenanceKey } from "../../lib/batch/provenance.ts";
import { ALL_FORMATS } from "../../lib/report/case_folder.ts";

const ALL = { formats: [...ALL_FORMATS], standalone: false };

// The canonical JSON of the default settings, keys sorted by hand (UTF-16 order).
const DEFAULTS_JSON = '{"allowEmpty":false,"areaMm2":2.37,"aspect":[4,3],"bestN":10,' +
  '"countLabels":["mitotic figure"],"fieldAreaMm2":0.2376,"formats":["csv","geojson","html","json"],' +
  '"mapScale":"linear","maxGridCells":25000000,"minCoverage":0.95,"minScore":0,"scheme":null,"shape":"rect",' +
  '"standalone":false,"strideUm":25,"top":3}';

Deno.test("canonicalJson() of the default settings is the documented text", () => {
  assert.equal(canonicalJson(effectiveSettings({}, ALL)), DEFAULTS_JSON);
});

Deno.test("settingsSha256() of the defaults equals an outside sha256 of the canonical text", () => {
  // Outside reference: GNU coreutils 9.1 sha256sum of DEFAULTS_JSON (printf '%s' … | sha256sum),
  // computed when this test was written (C). SHA-256 as specified in FIPS 180-4.
  assert.equal(
    settingsSha256({}, ALL),
    "a8e6365257f8a8670fe06d201a6b880845e2ccd5a20e90e42588f1ba2c045753",
  );
});

Deno.test("settingsSha256() is a second SHA-256's digest of the canonical JSON", async () => {
  // Outside check: Web Crypto's SHA-256 (WEBCRYPTO), another implementation than node:crypto.
  const options = { scheme: "canine-mct-2tier", strideUm: 50, shape: "circle" as const };
  const text = canonicalJson(effectiveSettings(options, ALL));
  const digest = await crypto.subtle.digest("SHA-256", new TextEncoder().encode(text));
  const hex = [...new Uint8Array(digest)].map((b) => b.toString(16).padStart(2, "0")).join("");
  assert.equal(settingsSha256(options, ALL), hex);
});

Deno.test("effectiveSettings() leaves out what cannot change a case folder", () => {
  const circle = effectiveSettings({ shape: "circle", aspect: [16, 9] }, ALL);
  assert.equal(circle.aspect, undefined, "a circle has no aspect");
  const noScheme = effectiveSettings({ simulations: 0, seed: 7 }, ALL);
  assert.equal(noScheme.simulations, undefined, "no simulations without a scheme");
  const scheme = effectiveSettings({ scheme: "gist" }, ALL);
  assert.equal(scheme.simulations, 999, "default simulations with a scheme");
  assert.equal(scheme.seed, 1);
  assert.equal(
    settingsSha256({ simulations: 0 }, ALL),
    settingsSha256({}, ALL),
    "simulations without a scheme do not count",
  );
  assert.equal(
    settingsSha256({}, { formats: ["json", "html", "csv", "geojson"], standalone: false }),
    settingsSha256({}, ALL),
    "format order does not count",
  );
  assert.notEqual(
    settingsSha256({}, { formats: ["json"], standalone: false }),
    settingsSha256({}, ALL),
  );
});

Deno.test("effectiveSettings() lays a case file's settings over the options", () => {
  const s = effectiveSettings({ scheme: "gist", minScore: 0.2 }, ALL, { minScore: 0.5 });
  assert.equal(s.minScore, 0.5);
  assert.equal(s.scheme, "gist");
});

Deno.test("provenanceKey() matches equal provenances and refuses malformed ones", () => {
  const src = [{ kind: "annotations" as const, path: "a.geojson", sha256: "ab" }];
  const a = caseProvenance(src, "s1");
  assert.equal(provenanceKey(a), provenanceKey(JSON.parse(JSON.stringify(a))));
  assert.notEqual(provenanceKey(a), provenanceKey(caseProvenance(src, "s2")));
  assert.notEqual(
    provenanceKey(a),
    provenanceKey({ ...a, hotfield_version: "0.0.1" }),
    "another version is another key",
  );
  assert.equal(provenanceKey({ inputs: [] }), null);
  assert.equal(provenanceKey("x"), null);
});

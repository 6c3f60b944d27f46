/**
 * Adult soft tissue sarcoma (human), FNCLCC mitotic count score.
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** FNCLCC mitotic score per 10 HPF: < 10 → 1, 10–19 → 2, ≥ 20 → 3. */
export const STS_FNCLCC: GradingScheme = {
  id: "sts-fnclcc",
  title: "Soft tissue sarcoma (adult), FNCLCC mitotic count score",
  shortName: "FNCLCC mitotic score",
  tumour: "soft tissue sarcoma",
  species: "human",
  basis: {
    kind: "fields",
    n: 10,
    fieldAreaMm2: 0.1734,
    note:
      "10 HPF; one HPF = 0.1734 mm² (1.734 mm²) was seen only in third-party study protocols (Trojani/Coindre), unconfirmed against the primary publication",
  },
  counting: { fields: 10, areaMm2: 1.734, text: "10 HPF in the most mitotically active area" },
  tiers: [
    { label: "score 1", from: { atLeast: 0 }, sourceText: "< 10 per 10 HPF" },
    { label: "score 2", from: { atLeast: 10 }, sourceText: "10–19 per 10 HPF" },
    { label: "score 3", from: { atLeast: 20 }, sourceText: "≥ 20 per 10 HPF" },
  ],
  primaryTier: 2,
  primaryReason: "the cut-off into the highest score (score 3, ≥ 20 per 10 HPF)",
  sources: [
    {
      key: "fnclcc",
      citation: "Guidelines for soft tissue sarcoma grading (FNCLCC), Sarcoma (Hindawi) 2010, " +
        "Table 1; PathologyOutlines soft tissue grading (2022)",
      mark: "V",
      usedFor: "cut-offs < 10 / 10–19 / ≥ 20 per 10 HPF",
    },
  ],
  mark: "M",
  notes: [
    "The HPF area 0.1734 mm² is unconfirmed against the primary publication: check it against your local guideline",
    "The grade adds differentiation (1–3) and necrosis (0 none, 1 < 50%, 2 ≥ 50%): grade 1 " +
    "2–3, grade 2 4–5, grade 3 6–8; hotfield gives the mitotic score only",
  ],
};

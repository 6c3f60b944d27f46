/**
 * Canine mammary carcinoma, mitotic score (Peña et al. 2013).
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** Peña mitotic score per 10 HPF of 0.237 mm²: 0–9 → 1, 10–19 → 2, > 19 → 3. */
export const CANINE_MAMMARY: GradingScheme = {
  id: "canine-mammary",
  title: "Canine mammary carcinoma, mitotic score (Peña)",
  shortName: "canine mammary carcinoma mitotic score",
  tumour: "mammary carcinoma",
  species: "dog",
  basis: {
    kind: "fields",
    n: 10,
    fieldAreaMm2: 0.237,
    note: "10 HPF of field diameter 0.55 mm, 0.237 mm² (2.37 mm²), as the source states",
  },
  counting: {
    fields: 10,
    areaMm2: 2.37,
    text: "10 HPF in the most mitotically active area; counts scale with field diameter",
  },
  tiers: [
    { label: "score 1", from: { atLeast: 0 }, sourceText: "0–9 per 10 HPF" },
    { label: "score 2", from: { atLeast: 10 }, sourceText: "10–19 per 10 HPF" },
    { label: "score 3", from: { above: 19 }, sourceText: "> 19 per 10 HPF" },
  ],
  primaryTier: 2,
  primaryReason: "the cut-off into the highest score (score 3, > 19 per 10 HPF)",
  sources: [
    {
      key: "pena2013",
      citation: "Peña L et al. Prognostic value of histological grading in noninflammatory " +
        "canine mammary carcinomas in a prospective study with two-year follow-up: " +
        "relationship with clinical and histological characteristics. Vet Pathol " +
        "2013;50(1):94-105. doi:10.1177/0300985812447830",
      mark: "V2",
      usedFor: "0–9 / 10–19 / > 19 per 10 HPF of 0.237 mm² (read in Withrow & MacEwen's Small " +
        "Animal Clinical Oncology, 6th ed., Tables 28.3/28.4A)",
    },
  ],
  mark: "V2",
  notes: [
    "'> 19' is kept as written; for whole counts it equals ≥ 20, but a rate scaled from " +
    "another window area between 19 and 20 falls in score 3",
    "The total score (with tubule formation and nuclear pleomorphism) 3–5 = grade I, 6–7 = II, " +
    "8–9 = III; hotfield gives the mitotic score only",
  ],
};

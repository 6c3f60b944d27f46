/**
 * Meningioma, CNS WHO grade by mitotic count (WHO CNS 5th ed., 2021).
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** Meningioma mitotic criteria: ≥ 4 (grade 2) and ≥ 20 (grade 3) per 10 HPF. */
export const MENINGIOMA_WHO: GradingScheme = {
  id: "meningioma-who",
  title: "Meningioma, CNS WHO grade by mitotic count",
  shortName: "WHO meningioma mitotic criteria",
  tumour: "meningioma",
  species: "human",
  basis: {
    kind: "fields",
    n: 10,
    fieldAreaMm2: 0.16,
    note: "10 consecutive HPF; HPF = 0.16 mm² (10 HPF = 1.6 mm²) is unconfirmed against the WHO " +
      "CNS5 chapter and unverified",
  },
  counting: {
    fields: 10,
    areaMm2: 1.6,
    text: "10 consecutive HPF in the most mitotically active area",
  },
  tiers: [
    {
      label: "grade 1 range",
      from: { atLeast: 0 },
      sourceText: "fewer than 4 per 10 HPF",
      meaning: "no mitotic criterion of grade 2 or 3 met",
    },
    {
      label: "grade 2 (atypical)",
      from: { atLeast: 4 },
      sourceText: "4–19 per 10 HPF (4 or more)",
      meaning: "mitotic criterion of CNS WHO grade 2 met",
    },
    {
      label: "grade 3 (anaplastic)",
      from: { atLeast: 20 },
      sourceText: "20 or more per 10 HPF",
      meaning: "mitotic criterion of CNS WHO grade 3 met",
    },
  ],
  primaryTier: 2,
  primaryReason: "the cut-off into the highest grade (grade 3, ≥ 20 per 10 HPF); the grade 2 " +
    "cut-off (≥ 4) is in the classification's tiers list",
  sources: [
    {
      key: "who2021cns",
      citation: "Louis DN et al. The 2021 WHO Classification of Tumors of the Central Nervous " +
        "System: a summary. Neuro Oncol 2021;23(8):1231-1251",
      mark: "V2",
      usedFor: "≥ 4 and ≥ 20 per 10 HPF (read in BMJ Best Practice and wiki summaries)",
    },
    {
      key: "perry1997",
      citation: "Perry A et al. Meningioma grading: an analysis of histologic parameters. " +
        "Am J Surg Pathol 1997;21(12):1455-1465",
      mark: "V",
      usedFor: "origin of the ≥ 4 per 10 HPF cut-off",
    },
  ],
  mark: "M",
  notes: [
    "HPF = 0.16 mm² is unconfirmed against the primary publication: check it against your local guideline; the equivalent densities ≥ 2.5 /mm² and ≥ 12.5 /mm² " +
    "follow from it",
    "Some secondary sources write '> 4' and '> 20'; the WHO text is '4 or more' and '20 or " +
    "more', used here",
    "Grade 2 also follows from brain invasion or ≥ 3 of 5 features, grade 3 from TERT promoter " +
    "mutation or CDKN2A/B homozygous deletion; hotfield assesses the mitotic count only",
  ],
};

/**
 * Cutaneous melanoma, dermal mitotic rate per mm² (AJCC 7th/8th).
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** Melanoma mitotic rate per mm²: nonmitogenic < 1/mm². */
export const MELANOMA: GradingScheme = {
  id: "melanoma",
  title: "Cutaneous melanoma, dermal mitotic rate",
  shortName: "melanoma dermal mitotic rate",
  tumour: "cutaneous melanoma",
  species: "human",
  basis: { kind: "mm2", areaMm2: 1 },
  counting: {
    areaMm2: 1,
    text: "Start in the dermal hotspot and continue into adjacent fields until 1 mm² is " +
      "covered; report an integer per mm² (a single mitosis found is 1/mm²)",
  },
  tiers: [
    { label: "nonmitogenic", from: { atLeast: 0 }, sourceText: "< 1 per mm²" },
    { label: "mitogenic", from: { atLeast: 1 }, sourceText: "≥ 1 per mm²" },
  ],
  primaryTier: 1,
  primaryReason: "the nonmitogenic/mitogenic boundary (≥ 1 per mm²)",
  sources: [
    {
      key: "seermelanoma",
      citation: "SEER Extent of Disease, 'Mitotic Rate Melanoma' and Collaborative Staging " +
        "SSF 7 notes",
      mark: "V",
      usedFor: "mitoses per mm², integer record, nonmitogenic < 1/mm²",
    },
    {
      key: "ajcc8melanoma",
      citation: "Gershenwald JE et al. Melanoma staging: evidence-based changes in the American " +
        "Joint Committee on Cancer eighth edition cancer staging manual. CA Cancer J Clin 2017",
      mark: "V2",
      usedFor: "mitotic rate dropped as a T1 sub-classifier but still recorded (citation " +
        "details unconfirmed against the primary publication)",
    },
  ],
  mark: "V",
  notes: [
    "AJCC 8th no longer uses the mitotic rate for T1 sub-classification; it remains a " +
    "prognostic factor",
    "1 mm² is said to be about 4 HPF (AJCC 7) or 'typically 5 HPF'; it depends on the field " +
    "number (4.21 fields at FN 22)",
    "With less than 1 mm² of dermal tumour, the figures in the whole dermal component are " +
    "reported",
  ],
};

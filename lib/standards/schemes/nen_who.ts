/**
 * Gastroenteropancreatic neuroendocrine neoplasms (WHO 2019, 5th ed.),
 * grade by mitotic rate.
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** WHO neuroendocrine grade by mitoses per 2 mm²: G1 < 2, G2 2–20, G3 > 20. */
export const NEN_WHO: GradingScheme = {
  id: "nen-who",
  title: "Neuroendocrine neoplasms (GEP-NET), WHO grade by mitotic rate",
  shortName: "WHO neuroendocrine grade",
  tumour: "gastroenteropancreatic neuroendocrine tumour",
  species: "human",
  basis: { kind: "mm2", areaMm2: 2 },
  counting: {
    areaMm2: 10,
    text: "Count mitoses over 10 mm² (50 fields of 0.2 mm²) in the most active area and " +
      "express per 2 mm² (the CAP protocols: 42 fields of 0.55 mm ≈ 10 mm², total divided by 5)",
  },
  tiers: [
    { label: "G1", from: { atLeast: 0 }, sourceText: "< 2 per 2 mm²" },
    { label: "G2", from: { atLeast: 2 }, sourceText: "2–20 per 2 mm²" },
    { label: "G3", from: { above: 20 }, sourceText: "> 20 per 2 mm²" },
  ],
  primaryTier: 2,
  primaryReason: "the cut-off into the highest grade (G3, > 20 per 2 mm²)",
  sources: [
    {
      key: "who2019digestive",
      citation: "WHO Classification of Tumours Editorial Board. Digestive System Tumours, " +
        "WHO Classification of Tumours, 5th ed. IARC, Lyon 2019",
      mark: "V2",
      usedFor: "G1 < 2, G2 2–20, G3 > 20 per 2 mm²; 10 mm² counting area (read in two " +
        "reproductions)",
    },
    {
      key: "capnet",
      citation: "College of American Pathologists. Neuroendocrine tumour protocols " +
        "(AJCC 8th era), as summarised on essentialpathology.info",
      mark: "V2",
      usedFor: "42 HPF of 0.55 mm ≈ 10 mm², divide by 5 for per 2 mm²",
    },
  ],
  mark: "V2",
  notes: [
    "The grade is the higher of the mitotic grade and the Ki-67 grade (G1 < 3%, G2 3–20%, " +
    "G3 > 20%); hotfield assesses the mitotic rate only",
    "Older texts counted per 10 HPF; the footnote '10 HPF at 0.5 mm = 2 mm²' is really 1.96 mm²",
    "Rates may be fractional (e.g. 11 in 10 mm² = 2.2 per 2 mm² → G2)",
  ],
};

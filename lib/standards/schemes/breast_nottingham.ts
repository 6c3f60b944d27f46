/**
 * Breast carcinoma, Nottingham (Elston–Ellis) mitotic score.
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** Nottingham mitotic score per 10 HPF of the reference field (0.274 mm², diameter 0.59 mm). */
export const BREAST_NOTTINGHAM: GradingScheme = {
  id: "breast-nottingham",
  title: "Breast carcinoma, Nottingham mitotic score (Elston–Ellis)",
  shortName: "Nottingham breast mitotic score",
  tumour: "invasive breast carcinoma",
  species: "human",
  basis: {
    kind: "fields",
    n: 10,
    fieldAreaMm2: 0.274,
    note: "10 HPF of the reference field (0.274 mm², field diameter 0.59 mm); cut-offs for " +
      "other fields scale with field area (see nottinghamCutoffs)",
  },
  counting: {
    fields: 10,
    areaMm2: 2.74,
    text: "10 consecutive HPF in the most mitotically active part, usually the periphery; " +
      "count unequivocal figures only. Field size must be established for each microscope",
  },
  tiers: [
    { label: "score 1", from: { atLeast: 0 }, sourceText: "0–9 per 10 HPF (< 10)" },
    { label: "score 2", from: { atLeast: 10 }, sourceText: "10–19 per 10 HPF" },
    { label: "score 3", from: { atLeast: 20 }, sourceText: "≥ 20 per 10 HPF (20+)" },
  ],
  primaryTier: 2,
  primaryReason: "the cut-off into the highest score (score 3)",
  sources: [
    {
      key: "elston1991",
      citation: "Elston CW, Ellis IO. Pathological prognostic factors in breast cancer. I. " +
        "The value of histological grade in breast cancer: experience from a large study " +
        "with long-term follow-up. Histopathology 1991;19(5):403-410",
      mark: "V2",
      usedFor: "reference field 0.274 mm² and cut-offs 0–9 / 10–19 / ≥ 20 (restated in " +
        "PathologyOutlines 2012 and the older CAP protocol; HL7 FHIR draft V)",
    },
    {
      key: "cap2019breast",
      citation: "College of American Pathologists. Protocol for the examination of resection " +
        "specimens from patients with invasive carcinoma of the breast, Feb 2019, Table 1 " +
        "(after Ellis & Elston in O'Malley & Pinder, Breast Pathology, 2006)",
      mark: "V2",
      usedFor: "the 30-row table by field diameter 0.40–0.69 mm (read in a public transcription)",
    },
  ],
  mark: "V2",
  notes: [
    "Boundary at 20: Elston & Ellis, HL7 and PathologyOutlines put 20 in score 3 (≥ 20); the " +
    "older CAP protocol text reads 'less than 10 / 10 to 20 / greater than 20', putting 20 in " +
    "score 2. hotfield follows Elston & Ellis (≥ 20 → score 3)",
    "The field-diameter table follows from score 2 from ⌈10·A/0.274⌉ and score 3 from " +
    "⌈20·A/0.274⌉ per 10 fields of area A = π(d/2)²; hotfield scales by area the same way",
    "The 0.44 mm row exists in three versions (6–10/≥ 11 as recalled from the 1991 paper, unconfirmed; " +
    "6–11/'11+' in PathologyOutlines 2012; 6–11/≥ 12 in CAP 2019, which the area rule reproduces)",
    "The HL7 per-mm² draft (≤ 3, 4–7, ≥ 8 /mm²) differs from the area-scaled 3.65 and 7.30 /mm²",
  ],
};

/**
 * Canine soft tissue sarcoma, mitotic score (Dennis et al. 2011 after Kuntz et al. 1997).
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** Canine soft tissue sarcoma mitotic score: 0–9 → 1, 10–19 → 2, ≥ 20 → 3 per 10 HPF (unconfirmed). */
export const CANINE_STS: GradingScheme = {
  id: "canine-sts",
  title: "Canine soft tissue sarcoma, mitotic score",
  shortName: "canine soft tissue sarcoma mitotic score",
  tumour: "soft tissue sarcoma",
  species: "dog",
  basis: {
    kind: "fields",
    n: 10,
    fieldAreaMm2: 0.237,
    note: "10 HPF; the source's field area is not known to us, so the veterinary standard " +
      "0.237 mm² per field (2.37 mm², Meuten et al. 2016) is assumed",
  },
  counting: { fields: 10, areaMm2: 2.37, text: "10 HPF in the most mitotically active area" },
  tiers: [
    { label: "score 1", from: { atLeast: 0 }, sourceText: "0–9 per 10 HPF" },
    { label: "score 2", from: { atLeast: 10 }, sourceText: "10–19 per 10 HPF" },
    { label: "score 3", from: { atLeast: 20 }, sourceText: "≥ 20 per 10 HPF" },
  ],
  primaryTier: 2,
  primaryReason: "the cut-off into the highest score (score 3, ≥ 20 per 10 HPF)",
  sources: [
    {
      key: "dennis2011",
      citation: "Dennis MM et al. Prognostic factors for cutaneous and subcutaneous soft " +
        "tissue sarcomas in dogs. Vet Pathol 2011;48(1):73-84. doi:10.1177/0300985810388820",
      mark: "M",
      usedFor:
        "cut-offs 0–9 / 10–19 / ≥ 20 per 10 HPF; citation confirmed, table not read (after Kuntz CA et al., " +
        "JAVMA 1997;211:1147-1151)",
    },
    {
      key: "fnclcc",
      citation: "FNCLCC grading as tabulated in the Hindawi Sarcoma 2010 guidelines, Table 1",
      mark: "V",
      usedFor: "the human scheme the canine cut-offs mirror (< 10, 10–19, ≥ 20 per 10 HPF)",
    },
  ],
  mark: "M",
  notes: [
    "The cut-offs are unconfirmed against the primary publication (its table could not be read) and mirror FNCLCC: check them against your local guideline",
    "The grade combines the mitotic score with differentiation (1–3) and necrosis (0–2): " +
    "grade I ≤ 4, II 5–6, III ≥ 7; hotfield gives the mitotic score only",
    "Veterinary STS grading methods are not standardised (WSAVA 2018 proceedings)",
  ],
};

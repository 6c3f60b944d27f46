/**
 * Canine cutaneous mast cell tumour, two-tier grade (Kiupel et al. 2011),
 * mitotic criterion only.
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** Kiupel two-tier grade, mitotic criterion: high grade at ≥ 7 mitotic figures in 10 HPF. */
export const CANINE_MCT_2TIER: GradingScheme = {
  id: "canine-mct-2tier",
  title: "Canine cutaneous mast cell tumour, two-tier grade (mitotic criterion)",
  shortName: "two-tier canine mast cell scheme",
  tumour: "cutaneous mast cell tumour",
  species: "dog",
  basis: {
    kind: "fields",
    n: 10,
    fieldAreaMm2: 0.237,
    note: "10 HPF at 400×; taken as the veterinary standard area of 2.37 mm² " +
      "(10 fields of FN 22 at 40×, Meuten et al. 2016)",
  },
  counting: {
    fields: 10,
    areaMm2: 2.37,
    text: "Count in the fields with the highest mitotic activity or the most anisokaryosis",
  },
  tiers: [
    {
      label: "low",
      from: { atLeast: 0 },
      sourceText: "fewer than 7 mitotic figures in 10 HPF",
      meaning: "mitotic criterion of high grade not met (other criteria may still make it high)",
    },
    {
      label: "high",
      from: { atLeast: 7 },
      sourceText: "≥ 7 mitotic figures in 10 HPF",
      meaning: "mitotic criterion of high grade met",
    },
  ],
  primaryTier: 1,
  primaryReason: "the scheme's only mitotic cut-off (high grade)",
  sources: [
    {
      key: "kiupel2011",
      citation: "Kiupel M et al. Proposal of a 2-tier histologic grading system for canine " +
        "cutaneous mast cell tumors to more accurately predict biological behavior. " +
        "Vet Pathol 2011;48(1):147-155. doi:10.1177/0300985810386469",
      mark: "V",
      usedFor: "cut-off ≥ 7 mitotic figures in 10 HPF (read in the abstract)",
    },
    {
      key: "meuten2016",
      citation: "Meuten DJ, Moore FM, George JW. Mitotic count and the field of view area: " +
        "time to standardize. Vet Pathol 2016;53(1):7-9. doi:10.1177/0300985815593349",
      mark: "V",
      usedFor: "10 HPF = 2.37 mm² (the standard confirmed through citing papers; exact wording M)",
    },
  ],
  mark: "V",
  notes: [
    "High grade also follows from any one of: ≥ 3 multinucleated cells in 10 HPF, ≥ 3 bizarre " +
    "nuclei in 10 HPF, or karyomegaly. hotfield assesses the mitotic criterion only",
    "2.37 mm² truncates the exact 10-field area of FN 22 at 40× (2.3758 mm²)",
  ],
};

/**
 * Gastrointestinal stromal tumour, mitotic rate for risk (AFIP, Miettinen & Lasota 2006).
 *
 * @module
 */

import type { GradingScheme } from "../scheme_types.ts";

/** GIST mitotic rate: ≤ 5 vs > 5 per 5 mm² (50 HPF). */
export const GIST: GradingScheme = {
  id: "gist",
  title: "Gastrointestinal stromal tumour, mitotic rate for risk assessment",
  shortName: "GIST mitotic rate",
  tumour: "gastrointestinal stromal tumour",
  species: "human",
  basis: {
    kind: "mm2",
    areaMm2: 5,
    note: "50 HPF treated as 5 mm² (AJCC GIST chapter equivalence)",
  },
  counting: {
    areaMm2: 5,
    fields: 50,
    text: "Count 5 mm² (about 25 fields with wide-field eyepieces); ESMO 2010 recommended 10 mm²",
  },
  tiers: [
    { label: "≤ 5 per 5 mm²", from: { atLeast: 0 }, sourceText: "≤ 5 per 50 HPF" },
    { label: "> 5 per 5 mm²", from: { above: 5 }, sourceText: "> 5 per 50 HPF" },
  ],
  primaryTier: 1,
  primaryReason: "the scheme's only mitotic cut-off (> 5 per 5 mm²)",
  sources: [
    {
      key: "miettinen2006",
      citation: "Miettinen M, Lasota J. Gastrointestinal stromal tumors: pathology and " +
        "prognosis at different sites. Semin Diagn Pathol 2006;23(2):70-83",
      mark: "V2",
      usedFor: "≤ 5 vs > 5 per 50 HPF (read in the Hindawi ISRN 2012 and NCI PDQ reproductions)",
    },
    {
      key: "seergist",
      citation: "SEER site-specific factor 5/6 notes for GIST (AJCC equivalence 50 HPF = 5 mm²)",
      mark: "V",
      usedFor: "50 HPF ≡ 5 mm²",
    },
  ],
  mark: "V2",
  notes: [
    "Risk also depends on tumour size and site; hotfield gives the mitotic rate category only",
    "Total area: 5 mm² (AFIP/AJCC) vs 10 mm² (ESMO 2010)",
    "WHO 5th ed. (2020) expresses the rate per 5 mm² (unconfirmed against the primary publication)",
  ],
};

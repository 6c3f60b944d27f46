/**
 * The recipes of the invented demo cohort (the fictional Quillmoor Veterinary
 * Teaching Laboratory): the data that describes each case — slide size and
 * mpp, tissue, tumour, exclusions, foci, background rates, readers' fields.
 * `generateDemoCohort` (demo_cohort.ts) turns them into annotation files.
 *
 * Positions are in the tissue's normalized frame: (0, 0) is the tissue
 * centre, the tissue outline lies at radius 0.75–1.25 and the tumour outline
 * inside radius 0.67 of it, so anything at radius ≤ 0.45 is tumour.
 *
 * All numbers are invented.
 *
 * @module
 */

/** An excluded zone of a demo case, in the tissue frame. */
export interface ExcludeRecipe {
  reason: string;
  u: number;
  v: number;
  rxMm: number;
  ryMm: number;
  rotation: number;
  /** Extra candidates placed inside the zone (mitotic-looking and lookalikes). */
  figures: number;
}

/** A focus of mitotic figures: a Gaussian cloud of `n` figures around (u, v). */
export interface FocusRecipe {
  u: number;
  v: number;
  sigmaUm: number;
  n: number;
}

/** A reader's field: a centre point, or a drawn polygon of about 2.37 mm². */
export interface FieldRecipe {
  reader: string;
  u: number;
  v: number;
  /** A drawn polygon of about 2.37 mm² instead of a centre point. */
  polygon?: boolean;
  label?: string;
  /**
   * When the field was read (ISO 8601 date). Dated fields belong to the
   * teaching series added after the slides were outlined, so they do not
   * steer where the generator puts tissue holes.
   */
  date?: string;
  /** Circular microscope fields (a MultiPoint with `field_diameter_mm`), `n` in rows of five about (u, v). */
  circles?: { n: number; diameterMm: number };
  /** Separate squares counted together (a MultiPolygon): one at (u, v) and one at each further centre. */
  squares?: { more: [number, number][]; sideMm: number };
}

/** Everything that describes one invented case; the generator adds the randomness. */
export interface CaseRecipe {
  caseId: string;
  tumourType: string;
  shows: string;
  scheme: string;
  mpp: number | [number, number];
  slideMm: [number, number];
  tissue: {
    cxMm: number;
    cyMm: number;
    rxMm: number;
    ryMm: number;
    rotation: number;
    vertices: number;
    holes: number;
  };
  /** Separate small tissue pieces (make the tissue a MultiPolygon). */
  fragments: { angle: number; rMm: number }[];
  tumourScale: number;
  excludes: ExcludeRecipe[];
  foci: FocusRecipe[];
  /** Uniform mitotic figures per mm² inside the tumour. */
  backgroundPerMm2: number;
  /** Uniform mitotic figures per mm² in tissue outside the tumour. */
  outsidePerMm2: number;
  /** Lookalike candidates spread over the tumour. */
  lookalikes: number;
  /** How figures are written. */
  figureStyle: "annotator" | "detector" | "csv";
  fields: FieldRecipe[];
  /** Tissue as a PNG mask with this many µm per mask pixel. */
  maskUmPerPx?: number;
  /** Write holes with the same winding as the outer ring (either is accepted). */
  sameWinding?: boolean;
}

const MCT = "canine cutaneous mast cell tumour";

/** The eight recipes, `QVT-24-001` … `QVT-24-008`, in case order. */
export const DEMO_RECIPES: readonly CaseRecipe[] = [
  {
    caseId: "QVT-24-001",
    tumourType: MCT,
    scheme: "canine-mct-2tier",
    shows:
      "A clearly high count: two strong foci over a busy background, far above 7 figures in 2.37 mm²; a small second tissue piece makes the tissue a MultiPolygon.",
    mpp: 0.25,
    slideMm: [25, 15],
    tissue: { cxMm: 11.5, cyMm: 7.5, rxMm: 7, ryMm: 5, rotation: 0.3, vertices: 520, holes: 5 },
    fragments: [{ angle: 0.2, rMm: 1.1 }],
    tumourScale: 0.56,
    excludes: [
      { reason: "necrosis", u: 0.3, v: -0.22, rxMm: 0.9, ryMm: 0.6, rotation: 0.4, figures: 9 },
      {
        reason: "fold artefact",
        u: -0.45,
        v: 0.35,
        rxMm: 1.6,
        ryMm: 0.18,
        rotation: -0.6,
        figures: 3,
      },
    ],
    foci: [
      { u: -0.15, v: 0.1, sigmaUm: 450, n: 32 },
      { u: 0.25, v: 0.22, sigmaUm: 600, n: 18 },
    ],
    backgroundPerMm2: 2.5,
    outsidePerMm2: 0.3,
    lookalikes: 70,
    figureStyle: "annotator",
    fields: [
      { reader: "reader-a", u: -0.13, v: 0.12 },
      { reader: "reader-b", u: 0.26, v: 0.2 },
      {
        reader: "trainee-1",
        u: 0.05,
        v: -0.32,
        date: "2024-01-15",
        circles: { n: 10, diameterMm: 0.55 },
        label: "10 HPF, FN 22 at 40×",
      },
    ],
  },
  {
    caseId: "QVT-24-002",
    tumourType: MCT,
    scheme: "canine-mct-2tier",
    shows:
      "A clearly low count: sparse figures and one weak focus, far below 7 in 2.37 mm² wherever the window is placed; apoptotic bodies and pyknotic nuclei must not be counted.",
    mpp: 0.252,
    slideMm: [20, 14],
    tissue: { cxMm: 10, cyMm: 7, rxMm: 6, ryMm: 4.5, rotation: -0.2, vertices: 420, holes: 3 },
    fragments: [],
    tumourScale: 0.55,
    excludes: [
      { reason: "haemorrhage", u: -0.2, v: 0.25, rxMm: 0.7, ryMm: 0.5, rotation: 0, figures: 2 },
    ],
    foci: [{ u: 0.1, v: 0, sigmaUm: 700, n: 3 }],
    backgroundPerMm2: 0.3,
    outsidePerMm2: 0.1,
    lookalikes: 60,
    figureStyle: "annotator",
    fields: [
      { reader: "reader-a", u: 0.12, v: 0.02 },
      { reader: "trainee-1", u: -0.28, v: -0.22, date: "2024-02-12" },
    ],
  },
  {
    caseId: "QVT-24-003",
    tumourType: MCT,
    scheme: "canine-mct-2tier",
    shows:
      "Borderline: the best 2.37 mm² holds about the cut-off of 7 figures while most placements hold fewer, so the class depends on the field; one reader drew a polygon instead of marking a centre.",
    mpp: 0.246,
    slideMm: [22, 16],
    tissue: { cxMm: 11, cyMm: 8, rxMm: 6.5, ryMm: 5.2, rotation: 0.9, vertices: 460, holes: 4 },
    fragments: [],
    tumourScale: 0.56,
    excludes: [
      { reason: "out of focus", u: 0.35, v: -0.3, rxMm: 1.2, ryMm: 0.8, rotation: 0.2, figures: 3 },
    ],
    foci: [
      { u: -0.1, v: -0.1, sigmaUm: 500, n: 5 },
      { u: 0.3, v: 0.25, sigmaUm: 550, n: 4 },
    ],
    backgroundPerMm2: 0.6,
    outsidePerMm2: 0.2,
    lookalikes: 50,
    figureStyle: "annotator",
    fields: [
      { reader: "reader-a", u: -0.1, v: -0.08 },
      { reader: "reader-b", u: 0.29, v: 0.24, polygon: true, label: "10 HPF drawn" },
      { reader: "trainee-1", u: -0.3, v: 0.3 },
      { reader: "trainee-1", u: 0.0, v: 0.05, date: "2024-03-11" },
    ],
  },
  {
    caseId: "QVT-24-004",
    tumourType: MCT,
    scheme: "canine-mct-2tier",
    shows:
      "Borderline, scanned with unequal pixel sides (0.2485 × 0.2512 µm): detector points with scores, one focus near the cut-off, an out-of-focus band excluded.",
    mpp: [0.2485, 0.2512],
    slideMm: [18, 14],
    tissue: { cxMm: 9, cyMm: 7, rxMm: 5.5, ryMm: 4.6, rotation: -0.5, vertices: 400, holes: 3 },
    fragments: [],
    tumourScale: 0.55,
    excludes: [
      {
        reason: "out of focus",
        u: -0.3,
        v: -0.05,
        rxMm: 2.2,
        ryMm: 0.35,
        rotation: 1.2,
        figures: 4,
      },
    ],
    foci: [{ u: 0.05, v: 0.12, sigmaUm: 420, n: 5 }],
    backgroundPerMm2: 0.8,
    outsidePerMm2: 0.2,
    lookalikes: 80,
    figureStyle: "detector",
    fields: [{ reader: "reader-c", u: 0.07, v: 0.1 }],
  },
  {
    caseId: "QVT-24-005",
    tumourType: MCT,
    scheme: "canine-mct-2tier",
    shows:
      "A small incisional biopsy: valid tumour tissue is well under 2.37 mm², so no window of the standard area fits and no hotspot can be placed.",
    mpp: 0.25,
    slideMm: [15, 10],
    tissue: { cxMm: 6.5, cyMm: 5, rxMm: 1.0, ryMm: 0.8, rotation: 0.1, vertices: 160, holes: 1 },
    fragments: [{ angle: 0.0, rMm: 0.45 }, { angle: 2.6, rMm: 0.35 }],
    tumourScale: 0.6,
    excludes: [
      {
        reason: "crush artefact",
        u: 0.2,
        v: 0.15,
        rxMm: 0.18,
        ryMm: 0.12,
        rotation: 0.5,
        figures: 1,
      },
    ],
    foci: [{ u: 0, v: 0, sigmaUm: 250, n: 4 }],
    backgroundPerMm2: 2.0,
    outsidePerMm2: 0.5,
    lookalikes: 8,
    figureStyle: "detector",
    fields: [{ reader: "reader-a", u: 0, v: 0 }],
  },
  {
    caseId: "QVT-24-006",
    tumourType: MCT,
    scheme: "canine-mct-2tier",
    shows:
      "A poor choice of field: one strong focus holds well over 7 figures, but trainee-2 counted a quiet area below the cut-off; reader-a found the focus.",
    mpp: 0.2505,
    slideMm: [24, 16],
    tissue: { cxMm: 12, cyMm: 8, rxMm: 7.2, ryMm: 5.4, rotation: 0.15, vertices: 500, holes: 6 },
    fragments: [],
    tumourScale: 0.57,
    excludes: [
      { reason: "necrosis", u: -0.05, v: -0.3, rxMm: 1.0, ryMm: 0.7, rotation: 0.9, figures: 8 },
      { reason: "ulceration", u: -0.35, v: 0.4, rxMm: 1.4, ryMm: 0.5, rotation: 0.1, figures: 2 },
    ],
    foci: [{ u: 0.3, v: -0.15, sigmaUm: 380, n: 20 }],
    backgroundPerMm2: 0.8,
    outsidePerMm2: 0.2,
    lookalikes: 60,
    figureStyle: "detector",
    fields: [
      { reader: "reader-a", u: 0.29, v: -0.14 },
      { reader: "trainee-2", u: -0.3, v: 0.05, label: "first field examined" },
      { reader: "trainee-1", u: 0.24, v: -0.12, date: "2024-04-08" },
    ],
  },
  {
    caseId: "QVT-24-007",
    tumourType: "canine soft tissue sarcoma",
    scheme: "canine-sts",
    shows:
      "Tissue from a PNG mask at 16 µm per mask pixel (not the slide's 0.25 µm/px), tied to the annotations by a case file; moderate foci.",
    mpp: 0.25,
    slideMm: [28, 18],
    tissue: { cxMm: 13, cyMm: 9, rxMm: 9, ryMm: 6, rotation: -0.35, vertices: 600, holes: 6 },
    fragments: [{ angle: 0.3, rMm: 1.4 }],
    tumourScale: 0.56,
    excludes: [
      { reason: "necrosis", u: 0.2, v: 0.3, rxMm: 1.5, ryMm: 1.0, rotation: 0.3, figures: 10 },
    ],
    foci: [
      { u: -0.25, v: -0.1, sigmaUm: 550, n: 10 },
      { u: 0.3, v: -0.2, sigmaUm: 500, n: 8 },
    ],
    backgroundPerMm2: 0.9,
    outsidePerMm2: 0.2,
    lookalikes: 60,
    figureStyle: "annotator",
    fields: [
      { reader: "reader-b", u: -0.24, v: -0.12 },
      {
        reader: "trainee-1",
        u: -0.25,
        v: -0.1,
        date: "2024-05-13",
        squares: { more: [[0.3, -0.2]], sideMm: 1.09 },
        label: "two areas counted together",
      },
    ],
    maskUmPerPx: 16,
  },
  {
    caseId: "QVT-24-008",
    tumourType: "canine mammary carcinoma",
    scheme: "canine-mammary",
    shows:
      "Figures from a detector's CSV (x,y,label,score) with many low-score candidates and lookalikes, tied to the outlines by a case file; several foci.",
    mpp: 0.243,
    slideMm: [24, 16],
    tissue: { cxMm: 12, cyMm: 8, rxMm: 7, ryMm: 5.5, rotation: 0.5, vertices: 480, holes: 5 },
    fragments: [{ angle: 3.4, rMm: 1.0 }],
    tumourScale: 0.56,
    excludes: [
      { reason: "necrosis", u: 0.1, v: 0.3, rxMm: 1.1, ryMm: 0.8, rotation: 0, figures: 12 },
      {
        reason: "fold artefact",
        u: -0.4,
        v: -0.3,
        rxMm: 1.3,
        ryMm: 0.15,
        rotation: 0.7,
        figures: 2,
      },
    ],
    foci: [
      { u: -0.2, v: 0.05, sigmaUm: 450, n: 16 },
      { u: 0.25, v: -0.15, sigmaUm: 500, n: 11 },
      { u: 0.05, v: 0.35, sigmaUm: 400, n: 8 },
    ],
    backgroundPerMm2: 1.8,
    outsidePerMm2: 0.3,
    lookalikes: 400,
    figureStyle: "csv",
    fields: [
      { reader: "reader-a", u: -0.2, v: 0.06 },
      { reader: "trainee-1", u: 0.0, v: -0.38 },
      {
        reader: "trainee-1",
        u: -0.2,
        v: 0.05,
        date: "2024-06-10",
        circles: { n: 10, diameterMm: 0.55 },
        label: "10 HPF, FN 22 at 40×",
      },
    ],
  },
];

/** Lookalike labels and how often each is drawn. */
export const LOOKALIKES: [string, number][] = [
  ["apoptotic body", 0.45],
  ["pyknotic nucleus", 0.35],
  ["hyperchromatic nucleus", 0.2],
];

/**
 * The grading scheme of each demo case, by case id (the scheme that fits its
 * invented tumour type).
 *
 * @returns A map from case id to scheme id.
 *
 * @example The borderline mast cell case
 * ```ts
 * import { demoSchemes } from "hotfield";
 * const scheme = demoSchemes().get("QVT-24-003");
 * if (scheme !== "canine-mct-2tier") throw new Error(`scheme ${scheme}`);
 * ```
 */
export function demoSchemes(): Map<string, string> {
  return new Map(DEMO_RECIPES.map((r) => [r.caseId, r.scheme]));
}

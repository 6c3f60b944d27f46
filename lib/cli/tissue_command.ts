/**
 * `hotfield tissue INPUT --out FILE.geojson`: finds the tissue on a slide
 * file or a PNG/JPEG thumbnail and writes it as an annotation GeoJSON that
 * `report` reads.
 *
 * @module
 */

import { encode } from "fast-png";
import { UsageError } from "../errors.ts";
import { roundTo } from "../numbers.ts";
import { writeFileAtomic } from "../io/write_atomic.ts";
import {
  detectSlideTissue,
  readSlideImage,
  slideFileKind,
  tissueFeatureCollection,
} from "../annotations/read_slide_file.ts";
import { parseDecimal, parseOptions } from "./_args.ts";
import type { CommandIo } from "./_io.ts";

const HELP = `Usage: hotfield tissue INPUT --out FILE.geojson [options]

Finds the tissue on a slide and writes it as an annotation GeoJSON (level-0
pixels, a "slide" member with id, mpp, width and height, and a feature with
role "tissue" recording every step of the method), ready for hotfield report.
INPUT is a slide file (any format the OpenSlide library reads, e.g. a tiled
pyramidal TIFF) or a PNG/JPEG thumbnail of one. A slide is read at a pyramid
level of about 8-16 µm per pixel.

Options:
  --out FILE.geojson     where to write the tissue (required)
  --mpp N | N,M          micrometres per pixel of INPUT (x, or x,y): for a slide,
                         per level-0 pixel (when the file does not say, or says
                         wrong); for a thumbnail, per thumbnail pixel (required)
  --slide-mpp N | N,M    micrometres per level-0 pixel of the slide a thumbnail
                         shows (required with a thumbnail)
  --mask-out FILE.png    also write the tissue mask (white = tissue) at the
                         resolution it was found, and print its mpp
  -h, --help             show this help

The outline is found automatically and can be wrong (pale tissue, folds, pen
marks, debris): look at it before counting on it. hotfield supports, never
replaces, a pathologist's diagnosis.

Exit codes: 0 written (warnings go to stderr), 1 bad input, 2 bad options.
`;

const OPTIONS = {
  out: { type: "string" },
  mpp: { type: "string" },
  "slide-mpp": { type: "string" },
  "mask-out": { type: "string" },
  help: { type: "boolean", short: "h" },
} as const;

/** Parses `N` or `N,M` (micrometres per pixel) for option `name`. */
function mppOption(raw: unknown, name: string): number | [number, number] | undefined {
  if (raw === undefined) return undefined;
  const text = String(raw);
  const parts = text.split(",").map((s) => s.trim());
  const nums = parts.map((s) => parseDecimal(s) ?? NaN);
  if ((parts.length !== 1 && parts.length !== 2) || nums.some((v) => !Number.isFinite(v))) {
    throw new UsageError(`Option --${name} needs a number N or a pair N,M: got "${text}"`);
  }
  if (nums.some((v) => v <= 0)) {
    throw new UsageError(`Option --${name} must be positive (micrometres per pixel): got ${text}`);
  }
  return nums.length === 1 ? nums[0] : [nums[0], nums[1]];
}

/**
 * Runs `hotfield tissue` with `args` and returns the exit code.
 *
 * @param args The arguments after `tissue`.
 * @param io Where to write text.
 * @returns 0 when the GeoJSON was written.
 * @throws {UsageError} For bad options (exit 2); other errors mean bad input (exit 1).
 *
 * @example Asking for help
 * ```ts
 * import { run } from "./tissue_command.ts";
 * const out: string[] = [];
 * const code = await run(["--help"], { stdout: (s) => out.push(s), stderr: () => {} });
 * if (code !== 0 || !out.join("").startsWith("Usage: hotfield tissue")) throw new Error();
 * ```
 */
export async function run(args: string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parseOptions(args, OPTIONS);
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length !== 1) {
    throw new UsageError(
      positionals.length === 0
        ? "Give one INPUT (a slide file or a PNG/JPEG thumbnail); see hotfield tissue --help"
        : `Give one INPUT, not ${positionals.length}: ${positionals.join(" ")}`,
    );
  }
  const out = values.out;
  if (typeof out !== "string" || out.trim() === "") {
    throw new UsageError("Option --out FILE.geojson is required: where to write the tissue");
  }
  const maskOut = values["mask-out"];
  if (maskOut !== undefined && (typeof maskOut !== "string" || maskOut.trim() === "")) {
    throw new UsageError("Option --mask-out needs a file name");
  }
  const input = positionals[0];
  let mpp = mppOption(values.mpp, "mpp");
  const slideMpp = mppOption(values["slide-mpp"], "slide-mpp");
  if (slideFileKind(input) === "slide") {
    // a slide's own pixels are level 0: both options mean the same
    if (mpp !== undefined && slideMpp !== undefined && String(mpp) !== String(slideMpp)) {
      throw new UsageError(
        `Options --mpp ${values.mpp} and --slide-mpp ${
          values["slide-mpp"]
        } disagree: for a slide file both give micrometres per level-0 pixel; give one`,
      );
    }
    mpp = mpp ?? slideMpp;
  }
  const image = await readSlideImage(input, {
    mpp,
    slideMpp: slideFileKind(input) === "slide" ? undefined : slideMpp,
  });
  const detection = detectSlideTissue(image);
  const fc = tissueFeatureCollection(image, detection);
  writeFileAtomic(out, JSON.stringify(fc) + "\n");
  if (maskOut !== undefined) {
    const { width, height, data } = detection.mask;
    const grey = new Uint8Array(data.length);
    for (let k = 0; k < data.length; k++) grey[k] = data[k] ? 255 : 0;
    writeFileAtomic(maskOut, encode({ width, height, data: grey, channels: 1, depth: 8 }));
  }
  for (const w of [...image.warnings, ...detection.warnings]) io.stderr(`warning: ${w}\n`);
  const r = (v: number, d: number) => String(roundTo(v, d));
  const pieces = detection.polygons.length;
  const where = image.level === null ? "thumbnail" : `level ${image.level}`;
  io.stdout(
    `${image.slide.id}\ttissue ${r(detection.areaMm2, 3)} mm² in ${pieces} piece${
      pieces === 1 ? "" : "s"
    }\t${where} at ${r(image.imageMppX, 3)}${
      image.imageMppY === image.imageMppX ? "" : `,${r(image.imageMppY, 3)}`
    } µm/px\t${out}\n`,
  );
  if (maskOut !== undefined) {
    io.stdout(
      `mask ${maskOut}: ${detection.mask.width} × ${detection.mask.height} px, --mask-mpp ${
        r(image.imageMppX, 6)
      }${image.imageMppY === image.imageMppX ? "" : `,${r(image.imageMppY, 6)}`}\n`,
    );
  }
  return 0;
}

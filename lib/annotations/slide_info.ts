/**
 * Reading the `slide` member of an annotation file (or a case file):
 * `{"id": string, "mpp": number | [x, y], "width"?: px, "height"?: px}`,
 * micrometres per level-0 pixel.
 *
 * @module
 */

import { inputError } from "../errors.ts";
import type { SlideInfo } from "../types.ts";
import { describe } from "./_describe.ts";
import { MAX_SLIDE_EXTENT_MM } from "../defaults.ts";

/** The `slide` member as written in a file. */
export interface SlideMember {
  /** Slide identifier. */
  id?: string;
  /** Micrometres per level-0 pixel: one value, or `[x, y]`. */
  mpp?: number | [number, number];
  /** Level-0 width in pixels. */
  width?: number;
  /** Level-0 height in pixels. */
  height?: number;
}

/** Smallest plausible level-0 mpp, µm/px (common practice: scanners give about 0.1–1). */
export const MIN_PLAUSIBLE_MPP = 0.01;
/** Largest plausible level-0 mpp, µm/px (common practice: a 5× scan is about 2 µm/px). */
export const MAX_PLAUSIBLE_MPP = 5;

/** Where a slide member was read, for messages. */
export interface SlideReadOptions {
  /** What was being read, e.g. `annotations` or `case file`. */
  what: string;
  /** The file's path as the user gave it. */
  fileName: string;
  /** Name of the member in messages. @default "slide" */
  member?: string;
}

/**
 * Reads and checks a `slide` member.
 *
 * Micrometres per pixel must be a positive finite number (or a pair of them)
 * between 0.01 and 5 µm/px: a larger value is most likely the mpp of a
 * downsampled image or a value in the wrong unit, a smaller one a value in
 * millimetres or metres. `width` and `height`, when present, must be positive
 * finite numbers of level-0 pixels. A missing `id` gives `""`.
 *
 * @param raw The parsed member (any JSON value).
 * @param options Where it was read, for messages.
 * @returns The slide metadata.
 * @throws {TypeError} When the member or a field has the wrong type or is missing.
 * @throws {RangeError} When mpp or a size is out of range.
 *
 * @example Reading unequal mpp
 * ```ts
 * import { parseSlideInfo } from "./slide_info.ts";
 * const s = parseSlideInfo({ id: "QVT-24-001", mpp: [0.25, 0.5], width: 1000 }, {
 *   what: "annotations",
 *   fileName: "QVT-24-001.geojson",
 * });
 * if (s.mppX !== 0.25 || s.mppY !== 0.5 || s.widthPx !== 1000) throw new Error(`slide ${JSON.stringify(s)}`);
 * ```
 */
export function parseSlideInfo(raw: unknown, options: SlideReadOptions): SlideInfo {
  const member = options.member ?? "slide";
  const fail = (Cls: typeof TypeError | typeof RangeError, detail: string) =>
    inputError(Cls, options.what, options.fileName, detail);
  const example = `e.g. "${member}": {"id": "QVT-24-001", "mpp": 0.25}`;
  if (raw === undefined || raw === null) {
    throw fail(
      TypeError,
      `no "${member}" member; give the slide's micrometres per pixel, ${example}`,
    );
  }
  if (typeof raw !== "object" || Array.isArray(raw)) {
    throw fail(TypeError, `"${member}" must be an object, ${example}: found ${describe(raw)}`);
  }
  const m = raw as Record<string, unknown>;
  let id = "";
  if (m.id !== undefined && m.id !== null) {
    if (typeof m.id === "number" && Number.isFinite(m.id)) id = String(m.id);
    else if (typeof m.id === "string") id = m.id;
    else throw fail(TypeError, `"${member}.id" must be a string: found ${describe(m.id)}`);
  }
  if (m.mpp === undefined || m.mpp === null) {
    throw fail(
      TypeError,
      `"${member}.mpp" is missing; give micrometres per level-0 pixel, ${example}`,
    );
  }
  let mppX: number;
  let mppY: number;
  if (typeof m.mpp === "number") {
    mppX = mppY = m.mpp;
  } else if (
    Array.isArray(m.mpp) && m.mpp.length === 2 && m.mpp.every((v) => typeof v === "number")
  ) {
    [mppX, mppY] = m.mpp as [number, number];
  } else {
    throw fail(
      TypeError,
      `"${member}.mpp" must be a number or a pair [x, y] of numbers (micrometres per pixel): found ${
        describe(m.mpp)
      }`,
    );
  }
  checkSlideMpp(mppX, `${member}.mpp`, fail);
  if (mppY !== mppX) checkSlideMpp(mppY, `${member}.mpp`, fail);
  const info: SlideInfo = { id, mppX, mppY };
  for (const [key, field] of [["width", "widthPx"], ["height", "heightPx"]] as const) {
    const v = m[key];
    if (v === undefined || v === null) continue;
    if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) {
      throw fail(
        typeof v === "number" ? RangeError : TypeError,
        `"${member}.${key}" must be a positive number of level-0 pixels: found ${describe(v)}`,
      );
    }
    const mm = v * (key === "width" ? mppX : mppY) / 1000;
    if (mm > MAX_SLIDE_EXTENT_MM) {
      throw fail(
        RangeError,
        `"${member}.${key}" ${v} px is ${
          Math.round(mm)
        } mm at the slide's mpp, more than any slide (${MAX_SLIDE_EXTENT_MM} mm); give the level-0 size in pixels`,
      );
    }
    info[field] = v;
  }
  return info;
}

function checkSlideMpp(
  v: number,
  name: string,
  fail: (Cls: typeof TypeError | typeof RangeError, detail: string) => Error,
): void {
  if (!Number.isFinite(v) || v <= 0) {
    throw fail(
      RangeError,
      `"${name}" must be a positive number of micrometres per pixel: found ${v}`,
    );
  }
  if (v > MAX_PLAUSIBLE_MPP) {
    throw fail(
      RangeError,
      `"${name}" ${v} µm/px is implausible for level-0 slide pixels (above ${MAX_PLAUSIBLE_MPP} µm/px): likely the mpp of a downsampled image or a value in the wrong unit; give micrometres per level-0 pixel (typically 0.1 to 1)`,
    );
  }
  if (v < MIN_PLAUSIBLE_MPP) {
    throw fail(
      RangeError,
      `"${name}" ${v} µm/px is implausible (below ${MIN_PLAUSIBLE_MPP} µm/px): likely a value in the wrong unit (millimetres or metres per pixel?); give micrometres per level-0 pixel (typically 0.1 to 1)`,
    );
  }
}

/**
 * Merges a `slide` member given in a case file over one from the annotation
 * file, field by field (the case file wins), and says which values changed.
 *
 * @param fromFile The member from the annotation file (may be absent).
 * @param override The member from the case file (may be absent).
 * @param labels Who sets each field, for the warnings (e.g. `{ mpp: "The manifest" }`).
 *   @default "The case file" for every field
 * @returns The merged member and a warning per overridden value.
 *
 * @example The case file corrects the mpp
 * ```ts
 * import { mergeSlideMembers, parseSlideInfo } from "./slide_info.ts";
 * const { member, warnings } = mergeSlideMembers({ id: "QVT-24-001", mpp: 0.5 }, { mpp: 0.25 });
 * const slide = parseSlideInfo(member, { what: "annotations", fileName: "QVT-24-001.geojson" });
 * if (slide.mppX !== 0.25) throw new Error(`merged mpp ${slide.mppX}, expected the case file's 0.25`);
 * if (warnings.length !== 1) throw new Error(`${warnings.length} warnings, expected one for the changed mpp`);
 * ```
 */
export function mergeSlideMembers(
  fromFile: unknown,
  override: SlideMember | undefined,
  labels: Partial<Record<keyof SlideMember, string>> = {},
): { member: unknown; warnings: string[] } {
  if (override === undefined) return { member: fromFile, warnings: [] };
  if (fromFile === undefined || fromFile === null || typeof fromFile !== "object") {
    return { member: override, warnings: [] };
  }
  const merged: Record<string, unknown> = { ...(fromFile as Record<string, unknown>) };
  const warnings: string[] = [];
  for (const [k, v] of Object.entries(override)) {
    if (v === undefined) continue;
    const old = merged[k];
    if (old !== undefined && JSON.stringify(old) !== JSON.stringify(v)) {
      warnings.push(
        `${labels[k as keyof SlideMember] ?? "The case file"} sets slide ${k} ${
          JSON.stringify(v)
        }, replacing ${JSON.stringify(old)} from the annotation file`,
      );
    }
    merged[k] = v;
  }
  return { member: merged, warnings };
}

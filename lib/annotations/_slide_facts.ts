/**
 * Checking a `slide` member against what a slide file says of itself.
 * Private to lib/annotations.
 *
 * @module
 */

import { inputError } from "../errors.ts";
import type { SlideFileFacts } from "./read_slide_file.ts";

/** Relative difference allowed between two mpp values (files round them to about 4 digits). */
const MPP_TOLERANCE = 1e-3;

/**
 * Fills a `slide` member's missing fields from a slide file and refuses
 * values that disagree with it: mpp beyond a relative 0.1 % on either axis,
 * width or height by more than 1 pixel. The member's `id` is kept when it
 * has one. Malformed values are left for `parseSlideInfo` to report.
 *
 * @param member The member as read (any JSON value, or undefined).
 * @param facts The slide file's facts.
 * @param what What the member was read from, e.g. `annotations`.
 * @param fileName That file, for messages.
 * @returns The member to parse.
 * @throws {RangeError} When a value disagrees (the message gives both values).
 */
export function withSlideFileFacts(
  member: unknown,
  facts: SlideFileFacts,
  what: string,
  fileName: string,
): unknown {
  if (member === undefined || member === null) return { ...facts.member };
  if (typeof member !== "object" || Array.isArray(member)) return member;
  const m = { ...(member as Record<string, unknown>) };
  const f = facts.member;
  const disagree = (detail: string) =>
    inputError(RangeError, what, fileName, `${detail}; they must agree (or leave the value out)`);
  const mpp = m.mpp;
  let given: [number, number] | undefined;
  if (typeof mpp === "number") given = [mpp, mpp];
  else if (Array.isArray(mpp) && mpp.length === 2 && mpp.every((v) => typeof v === "number")) {
    given = [mpp[0], mpp[1]];
  }
  if (given !== undefined && given.every((v) => Number.isFinite(v) && v > 0)) {
    const off = given.some((v, a) => Math.abs(v - f.mpp[a]) > MPP_TOLERANCE * f.mpp[a]);
    if (off) {
      throw disagree(
        `slide mpp ${show(given)} µm/px disagrees with slide file "${facts.path}" (${
          show(f.mpp)
        } µm/px, from ${facts.mppFrom})`,
      );
    }
  } else if (mpp === undefined || mpp === null) {
    m.mpp = f.mpp;
  }
  for (const key of ["width", "height"] as const) {
    const v = m[key];
    if (typeof v === "number" && Number.isFinite(v)) {
      if (Math.abs(v - f[key]) > 1) {
        throw disagree(
          `slide ${key} ${v} px disagrees with slide file "${facts.path}" (${
            f[key]
          } px at level 0)`,
        );
      }
    } else if (v === undefined || v === null) {
      m[key] = f[key];
    }
  }
  if (m.id === undefined || m.id === null || m.id === "") m.id = f.id;
  return m;
}

function show([x, y]: [number, number]): string {
  return x === y ? String(x) : `[${x}, ${y}]`;
}

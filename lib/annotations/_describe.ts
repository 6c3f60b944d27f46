/** Short descriptions of JSON values for messages. @module */

/** A short description of a JSON value for messages. */
export function describe(v: unknown): string {
  if (v === null) return "null";
  if (Array.isArray(v)) {
    const s = JSON.stringify(v);
    return s.length > 40 ? `an array of ${v.length}` : s;
  }
  if (typeof v === "object") return "an object";
  if (typeof v === "string") {
    return JSON.stringify(v.length > 40 ? v.slice(0, 37) + "..." : v);
  }
  return String(v);
}

/**
 * Escaping text taken from input (case ids, reader names, reasons, warnings)
 * for HTML, and data for `<script>` blocks.
 *
 * @module
 */

const HTML_ESCAPES: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/**
 * Escapes text for HTML element content and quoted attribute values.
 *
 * @param text Any text; non-strings are converted with `String()`.
 * @returns The text with `& < > " '` replaced by entities.
 *
 * @example A reader name with markup renders as text
 * ```ts
 * import { escapeHtml } from "./html_escape.ts";
 * const s = escapeHtml('<b>"reader-a" & co</b>');
 * if (s !== "&lt;b&gt;&quot;reader-a&quot; &amp; co&lt;/b&gt;") throw new Error(s);
 * ```
 */
export function escapeHtml(text: unknown): string {
  return String(text).replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/**
 * JSON text that is safe inside an HTML `<script>` element: `<`, `>`, `&`,
 * U+2028 and U+2029 are written as `\uXXXX` escapes, so no input can close
 * the script or start a comment, and the result still parses as the same
 * JSON (and as JavaScript).
 *
 * @param value Plain data.
 * @returns JSON text without `<`, `>`, `&` or line/paragraph separators.
 *
 * @example A closing script tag stays inside the string
 * ```ts
 * import { jsonForScript } from "./html_escape.ts";
 * const s = jsonForScript({ name: "</script><b>&" });
 * if (s.includes("<") || s.includes("&")) throw new Error(s);
 * if (JSON.parse(s).name !== "</script><b>&") throw new Error("the JSON must read back unchanged");
 * ```
 */
export function jsonForScript(value: unknown): string {
  return JSON.stringify(value).replace(
    /[<>&\u2028\u2029]/g,
    (c) => "\\u" + c.charCodeAt(0).toString(16).padStart(4, "0"),
  );
}

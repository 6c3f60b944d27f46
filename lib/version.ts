/** hotfield's version, written into every report. Keep in step with deno.json. */
export const HOTFIELD_VERSION = "0.1.0";

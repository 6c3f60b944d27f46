/**
 * The OpenSlide C library through Deno's FFI (`Deno.dlopen`), loaded on first
 * use. Private: {@linkcode openSlide} in `open_slide.ts` is the interface.
 *
 * OpenSlide 3.4 and 4.x keep the functions used here with the same
 * signatures. Strings cross as NUL-terminated UTF-8; `openslide_read_region`
 * fills premultiplied ARGB pixels as native-endian 32-bit words.
 *
 * @module
 */

const SYMBOLS = {
  openslide_open: { parameters: ["buffer"], result: "pointer" },
  openslide_close: { parameters: ["pointer"], result: "void" },
  openslide_get_error: { parameters: ["pointer"], result: "pointer" },
  openslide_get_level_count: { parameters: ["pointer"], result: "i32" },
  openslide_get_level_dimensions: {
    parameters: ["pointer", "i32", "buffer", "buffer"],
    result: "void",
  },
  openslide_get_level_downsample: { parameters: ["pointer", "i32"], result: "f64" },
  openslide_get_property_names: { parameters: ["pointer"], result: "pointer" },
  openslide_get_property_value: { parameters: ["pointer", "buffer"], result: "pointer" },
  openslide_read_region: {
    parameters: ["pointer", "buffer", "i64", "i64", "i32", "i64", "i64"],
    result: "void",
  },
  openslide_get_version: { parameters: [], result: "pointer" },
} as const;

/** The loaded library's functions. */
export type OpenSlideLib = Deno.DynamicLibrary<typeof SYMBOLS>["symbols"];

/** How to install the library, for messages. */
export const OPENSLIDE_INSTALL_HINT =
  "install OpenSlide: apt-get install libopenslide0 (Debian or Ubuntu); PNG and JPEG thumbnails work without it";

/** File names tried in turn (OpenSlide 3.4 first, then 4.x), per platform. */
function candidates(): string[] {
  switch (Deno.build.os) {
    case "darwin":
      return ["libopenslide.1.dylib", "libopenslide.0.dylib"];
    case "windows":
      return ["libopenslide-1.dll", "libopenslide-0.dll"];
    default:
      return ["libopenslide.so.0", "libopenslide.so.1"];
  }
}

let loaded: OpenSlideLib | undefined;

/**
 * Loads OpenSlide once and returns its functions.
 *
 * @throws {Error} When FFI is not permitted (`--allow-ffi`) or the library is
 *   not installed; the message says what to do.
 */
export function openSlideLib(): OpenSlideLib {
  if (loaded !== undefined) return loaded;
  const tried: string[] = [];
  for (const name of candidates()) {
    try {
      loaded = Deno.dlopen(name, SYMBOLS).symbols;
      return loaded;
    } catch (e) {
      if (e instanceof Deno.errors.NotCapable || e instanceof Deno.errors.PermissionDenied) {
        throw new Error(
          "Reading slide files calls the OpenSlide library, which needs Deno's --allow-ffi permission (the hotfield task grants it)",
        );
      }
      tried.push(name);
    }
  }
  throw new Error(
    `The OpenSlide library is not installed (tried ${tried.join(", ")}): ${OPENSLIDE_INSTALL_HINT}`,
  );
}

/** NUL-terminated UTF-8 bytes of `s`, for a `buffer` parameter. */
export function cString(s: string): Uint8Array<ArrayBuffer> {
  const bytes = new TextEncoder().encode(s);
  const out = new Uint8Array(bytes.length + 1);
  out.set(bytes);
  return out;
}

/** Reads a C string, or `null` for a null pointer. */
export function readCString(p: Deno.PointerValue): string | null {
  return p === null ? null : Deno.UnsafePointerView.getCString(p);
}

/** Reads a NULL-terminated array of C strings. */
export function readCStringArray(p: Deno.PointerValue): string[] {
  if (p === null) return [];
  const view = new Deno.UnsafePointerView(p);
  const out: string[] = [];
  for (let i = 0;; i++) {
    const q = Deno.UnsafePointer.create(view.getBigUint64(i * 8));
    if (q === null) break;
    out.push(Deno.UnsafePointerView.getCString(q));
  }
  return out;
}

/**
 * The floor a reader is measured against: read a file, decode it as UTF-8
 * and `JSON.parse` it, nothing else (`deno run -A bench/_bare_parse.ts FILE`).
 *
 * @module
 */

const [path] = Deno.args;
const value = JSON.parse(new TextDecoder().decode(Deno.readFileSync(path)));
// Touch the result so nothing is optimized away.
if (value === null) Deno.exit(1);

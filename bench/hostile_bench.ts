/**
 * Benchmark rows of hostile and oversized inputs (called from run_bench.ts):
 * whole `hotfield` processes under GNU time when present, each with the
 * contract's bound beside it: no input of 200 MB or less may run past 60 s
 * or 4 GB without a message. Refusals should come much sooner.
 *
 * Rows: a single MultiPoint of 1 and 2 million positions read by `inspect`
 * (time ratio near 2: linear); a 200 MB file of 1.3 million figure features
 * and the 2-million MultiPoint through `report` (refused over the counted
 * limit); a 40,000 × 30,000 PNG mask and a PNG whose data inflates to
 * 500 MB (refused from the header / while streaming); 200 MB of empty JSON
 * objects (refused before parsing); outlines of 2.9 million vertices (near
 * the limit: reported) and 4 million (refused); and the placement search's
 * worst cases, a million figures spread evenly over 250 mm² (reported) and
 * over 100 mm² (stopped at the search's work limit).
 * `--quick` leaves out the 200 MB files, the 2.9-million outline and the
 * evenly spread millions.
 *
 * @module
 */

import { closeSync, existsSync, mkdirSync, openSync, writeFileSync, writeSync } from "node:fs";
import { join } from "node:path";
import { deflateSync } from "node:zlib";
import { encode } from "fast-png";

/** What run_bench.ts lends these rows. */
export interface HostileBenchContext {
  /** Project root. */
  root: string;
  /** bench/output. */
  out: string;
  /** Fewer, smaller files. */
  quick: boolean;
  /** Adds a row: step, measured, target, pass (null: info), note. */
  add(step: string, value: string, target: string, pass: boolean | null, note?: string): void;
  /** Logs progress to stderr. */
  log(line: string): void;
}

const GNU_TIME = "/usr/bin/time";
const SLIDE = { id: "QVT-24-099", mpp: 0.25, width: 120000, height: 80000 };

async function timed(root: string, args: string[]) {
  const deno = Deno.execPath();
  const base = [deno, "run", "--allow-read", "--allow-write", "--allow-env", "lib/cli.ts", ...args];
  const useTime = existsSync(GNU_TIME);
  const cmd = new Deno.Command(useTime ? GNU_TIME : base[0], {
    args: useTime ? ["-v", ...base] : base.slice(1),
    cwd: root,
    env: { NO_COLOR: "1" },
    signal: AbortSignal.timeout(300_000),
  });
  const t = performance.now();
  const r = await cmd.output();
  const wallMs = performance.now() - t;
  const stderr = new TextDecoder().decode(r.stderr);
  const m = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
  const message = stderr.split("\n").find((l) => l.startsWith("hotfield ")) ?? "";
  return { wallMs, rssMb: m ? Number(m[1]) / 1024 : null, code: r.code, message };
}

/** A seeded sequence in [0, 1). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1103515245) + 12345) >>> 0) / 4294967296;
}

function tissueRing(n: number): number[][] {
  const r: number[][] = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    const rad = 30000 + 2000 * Math.sin(7 * t) + 500 * Math.sin(53 * t);
    const x = 60000 + rad * Math.cos(t) * 1.5, y = 40000 + rad * Math.sin(t);
    r.push([Math.round(x * 100) / 100, Math.round(y * 100) / 100]);
  }
  r.push(r[0]);
  return r;
}

const tissue = (n: number) => ({
  type: "Feature",
  properties: { role: "tissue" },
  geometry: { type: "Polygon", coordinates: [tissueRing(n)] },
});

function multiPointFile(path: string, n: number): void {
  if (existsSync(path)) return;
  const rnd = lcg(n);
  const pts: number[][] = [];
  for (let i = 0; i < n; i++) {
    pts.push([Math.round(20000 + rnd() * 80000), Math.round(15000 + rnd() * 50000)]);
  }
  writeFileSync(
    path,
    JSON.stringify({
      type: "FeatureCollection",
      slide: SLIDE,
      features: [tissue(2000), {
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "MultiPoint", coordinates: pts },
      }],
    }),
  );
}

/** `n` figures spread evenly over a `sideUm` square (as one MultiPoint) on a larger square of tissue. */
function evenSquareFile(path: string, n: number, sideUm: number): void {
  if (existsSync(path)) return;
  const rnd = lcg(n + 17);
  const side = sideUm / SLIDE.mpp, cx = SLIDE.width / 2, cy = SLIDE.height / 2;
  const pts: number[][] = [];
  for (let i = 0; i < n; i++) {
    pts.push([Math.round(cx - side / 2 + rnd() * side), Math.round(cy - side / 2 + rnd() * side)]);
  }
  const m = side / 2 + 4000;
  const ring = [[cx - m, cy - m], [cx + m, cy - m], [cx + m, cy + m], [cx - m, cy + m], [
    cx - m,
    cy - m,
  ]];
  writeFileSync(
    path,
    JSON.stringify({
      type: "FeatureCollection",
      slide: SLIDE,
      features: [{
        type: "Feature",
        properties: { role: "tissue" },
        geometry: { type: "Polygon", coordinates: [ring] },
      }, {
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "MultiPoint", coordinates: pts },
      }],
    }),
  );
}

/** Streams a file of `n` figure Point features (about 150 bytes each). */
function pointsFile(path: string, n: number): void {
  if (existsSync(path)) return;
  const rnd = lcg(7);
  const fd = openSync(path, "w");
  const enc = new TextEncoder();
  writeSync(
    fd,
    enc.encode(
      `{"type":"FeatureCollection","slide":${JSON.stringify(SLIDE)},"features":[${
        JSON.stringify(tissue(2000))
      }`,
    ),
  );
  let buf = "";
  for (let i = 0; i < n; i++) {
    buf += `,{"type":"Feature","properties":{"role":"figure","score":${
      rnd().toFixed(4)
    },"label":"mitotic figure"},"geometry":{"type":"Point","coordinates":[${
      (20000 + rnd() * 80000).toFixed(2)
    },${(15000 + rnd() * 50000).toFixed(2)}]}}`;
    if (buf.length > 1 << 20) {
      writeSync(fd, enc.encode(buf));
      buf = "";
    }
  }
  writeSync(fd, enc.encode(buf + "]}"));
  closeSync(fd);
}

function emptyObjectsFile(path: string, bytes: number): void {
  if (existsSync(path)) return;
  const fd = openSync(path, "w");
  const enc = new TextEncoder();
  writeSync(fd, enc.encode('{"type":"FeatureCollection","slide":{"mpp":0.25},"features":['));
  const chunk = enc.encode("{},".repeat(1 << 18));
  for (let w = 0; w < bytes; w += chunk.length) writeSync(fd, chunk);
  writeSync(fd, enc.encode("{}]}"));
  closeSync(fd);
}

function outlineFile(path: string, n: number): void {
  if (existsSync(path)) return;
  writeFileSync(
    path,
    JSON.stringify({
      type: "FeatureCollection",
      slide: SLIDE,
      features: [tissue(n), {
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "Point", coordinates: [60000, 40000] },
      }],
    }),
  );
}

function crc32(buf: Uint8Array): number {
  let crc = 0xffffffff;
  for (let n = 0; n < buf.length; n++) {
    let c = (crc ^ buf[n]) & 0xff;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    crc = (crc >>> 8) ^ c;
  }
  return (crc ^ 0xffffffff) >>> 0;
}

/** A 16 × 16 greyscale PNG whose image data inflates to `raw` bytes. */
function inflateBomb(path: string, raw: number): void {
  if (existsSync(path)) return;
  const small = encode({ width: 16, height: 16, data: new Uint8Array(256), channels: 1, depth: 8 });
  const z = deflateSync(new Uint8Array(raw), { level: 9 });
  const idat = new Uint8Array(12 + z.length);
  const dv = new DataView(idat.buffer);
  dv.setUint32(0, z.length);
  idat.set([73, 68, 65, 84], 4);
  idat.set(z, 8);
  dv.setUint32(8 + z.length, crc32(idat.subarray(4, 8 + z.length)));
  const iend = new Uint8Array([0, 0, 0, 0, 73, 69, 78, 68, 0xae, 0x42, 0x60, 0x82]);
  const parts = [small.subarray(0, 33), idat, iend];
  const file = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) file.set(p, o), o += p.length;
  writeFileSync(path, file);
}

/** A 1-bit 40,000 × 30,000 PNG with one rectangle of tissue. */
function bigMask(path: string): void {
  if (existsSync(path)) return;
  const w = 40000, h = 30000, row = w / 8;
  const data = new Uint8Array(row * h);
  for (let y = 10000; y < 20000; y++) data.fill(255, y * row + 1250, y * row + 3750);
  writeFileSync(path, encode({ width: w, height: h, data, channels: 1, depth: 1 }));
}

function mb(path: string): string {
  return `${(Deno.statSync(path).size / 1e6).toFixed(1)} MB`;
}

/** Runs the rows. */
export async function hostileBenchRows(ctx: HostileBenchContext): Promise<void> {
  const { root, quick, add, log } = ctx;
  const dir = join(ctx.out, "hostile");
  mkdirSync(dir, { recursive: true });
  const within = (r: { wallMs: number; rssMb: number | null }) =>
    r.wallMs < 60_000 && (r.rssMb === null || r.rssMb < 4096);
  // A report with JSON output only and no scan test: the rows time the reading and the searches.
  const reportJson = (path: string) =>
    timed(root, [
      "report",
      path,
      "--out",
      join(dir, "out"),
      "--format",
      "json",
      "--simulations",
      "0",
    ]);
  const show = (r: { wallMs: number; rssMb: number | null }) =>
    `${(r.wallMs / 1000).toFixed(2)} s${r.rssMb === null ? "" : `, ${Math.round(r.rssMb)} MB`}`;

  log("Hostile inputs: generating files …");
  const mp1 = join(dir, "multipoint-1m.geojson"), mp2 = join(dir, "multipoint-2m.geojson");
  multiPointFile(mp1, 1_000_000);
  multiPointFile(mp2, 2_000_000);
  const a = await timed(root, ["inspect", mp1]);
  const b = await timed(root, ["inspect", mp2]);
  add("inspect: one MultiPoint of 1 M positions", show(a), "< 60 s, < 4 GB", within(a), mb(mp1));
  add(
    "inspect: one MultiPoint of 2 M positions",
    show(b),
    "time ratio 2M/1M ≤ 2.5 (linear)",
    b.wallMs / a.wallMs <= 2.5 && within(b),
    `${mb(mp2)}; ratio ${(b.wallMs / a.wallMs).toFixed(2)}`,
  );
  const rep = await timed(root, ["report", mp2, "--out", join(dir, "out")]);
  add(
    "report: MultiPoint of 2 M positions (refused: counted limit)",
    show(rep),
    "exit 1 with a message, < 60 s",
    rep.code === 1 && rep.message !== "" && within(rep),
    rep.message.slice(0, 80),
  );

  const maskCase = join(dir, "mask-case.geojson");
  writeFileSync(
    maskCase,
    JSON.stringify({
      type: "FeatureCollection",
      slide: SLIDE,
      features: [{
        type: "Feature",
        properties: { role: "figure" },
        geometry: { type: "Point", coordinates: [5, 5] },
      }],
    }),
  );
  const big = join(dir, "mask-40000x30000.png");
  bigMask(big);
  const m = await timed(root, ["inspect", maskCase, "--tissue-mask", big, "--mask-mpp", "0.75"]);
  add(
    "inspect: 40,000 × 30,000 PNG mask (refused from its header)",
    show(m),
    "exit 1, < 5 s, < 1 GB",
    m.code === 1 && m.wallMs < 5000 && (m.rssMb === null || m.rssMb < 1024),
    `${mb(big)}; ${m.message.slice(0, 60)}`,
  );
  const bomb = join(dir, "inflate-bomb.png");
  inflateBomb(bomb, 500_000_000);
  const ib = await timed(root, ["inspect", maskCase, "--tissue-mask", bomb, "--mask-mpp", "0.25"]);
  add(
    "inspect: 16 × 16 PNG whose data inflates to 500 MB (refused)",
    show(ib),
    "exit 1, < 5 s, < 1 GB",
    ib.code === 1 && ib.wallMs < 5000 && (ib.rssMb === null || ib.rssMb < 1024),
    mb(bomb),
  );
  const o4 = join(dir, "outline-4m.geojson");
  outlineFile(o4, 4_000_000);
  const r4 = await timed(root, ["report", o4, "--out", join(dir, "out"), "--format", "json"]);
  add(
    "report: outline of 4 M vertices (refused: outline limit)",
    show(r4),
    "exit 1, < 10 s",
    r4.code === 1 && r4.wallMs < 10_000,
    mb(o4),
  );
  if (quick) return;
  // The placement search's worst case: counted figures spread evenly (no
  // window stands out, so few cells can be passed over), near the counted limit.
  const even = await reportJson(mp1);
  add(
    "report: 1 M figures spread evenly over 250 mm² (about 930,000 counted)",
    show(even),
    "exit 0, < 60 s, < 4 GB",
    even.code === 0 && within(even),
    `${mb(mp1)}; about 3,700 per mm², near the counted limit`,
  );
  const dense = join(dir, "even-1m-100mm2.geojson");
  evenSquareFile(dense, 1_000_000, 10_000);
  const rd = await reportJson(dense);
  add(
    "report: 1 M figures spread evenly over 100 mm² (stopped: search work limit)",
    show(rd),
    "exit 1 with a message, < 60 s, < 4 GB",
    rd.code === 1 && rd.message !== "" && within(rd),
    `${mb(dense)}; 10,000 per mm²; ${rd.message.slice(0, 80)}`,
  );
  const o3 = join(dir, "outline-2.9m.geojson");
  outlineFile(o3, 2_900_000);
  const r3 = await reportJson(o3);
  add(
    "report: outline of 2.9 M vertices (near the limit)",
    show(r3),
    "exit 0, < 60 s, < 4 GB",
    r3.code === 0 && within(r3),
    mb(o3),
  );
  const p = join(dir, "points-1.3m.geojson");
  pointsFile(p, 1_300_000);
  const rp = await timed(root, ["report", p, "--out", join(dir, "out")]);
  add(
    "report: 1.3 M figure Point features (refused: counted limit)",
    show(rp),
    "exit 1 with a message, < 60 s, < 4 GB",
    rp.code === 1 && rp.message !== "" && within(rp),
    mb(p),
  );
  const e = join(dir, "empty-objects.geojson");
  emptyObjectsFile(e, 200_000_000);
  const re = await timed(root, ["inspect", e]);
  add(
    "inspect: 200 MB of empty JSON objects (refused before parsing)",
    show(re),
    "exit 1, < 10 s, < 2 GB",
    re.code === 1 && re.wallMs < 10_000 && (re.rssMb === null || re.rssMb < 2048),
    mb(e),
  );
}

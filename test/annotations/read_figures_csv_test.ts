// Tests of parseFiguresCsv(). CSV quoting follows RFC 4180 (Shafranovich,
// "Common Format and MIME Type for Comma-Separated Values (CSV) Files",
// RFC 4180, IETF 2005; key RFC4180 in test/reference/README.md).

import { strict as assert } from "node:assert";
import { parseCsvBoth } from "./_both_readers.ts";

// Every input here goes through both the ordinary reader and the byte
// scanner, which must agree (result, or error class and message).
const parseFiguresCsv = parseCsvBoth;

const FILE = "QVT-24-002.figures.csv";
const MPP = { mppX: 0.25, mppY: 0.5 };

function parse(text: string, units?: "px" | "um") {
  return parseFiguresCsv(text, { fileName: FILE, units, ...MPP });
}

Deno.test("parseFiguresCsv() reads x, y, label and score in any column order", () => {
  const { figures, warnings } = parse("score,label,y,x\n0.9,mitotic figure,20,10\n,,40,30\n");
  assert.deepEqual(Array.from(figures.xPx), [10, 30]);
  assert.deepEqual(Array.from(figures.yPx), [20, 40]);
  assert.deepEqual(figures.labels, ["mitotic figure"]);
  assert.equal(figures.score[0], 0.9);
  assert.ok(Number.isNaN(figures.score[1]), "an empty score cell means no score");
  assert.deepEqual(Array.from(figures.origin), [2, 3], "origins are file lines, header = line 1");
  assert.deepEqual(warnings, []);
});

Deno.test("parseFiguresCsv() keeps a quoted label with a comma and a quote (RFC 4180 §2.6, §2.7)", () => {
  // RFC 4180 §2.6: fields containing commas are enclosed in double quotes;
  // §2.7: a double quote inside is escaped by doubling it.
  const { figures } = parse('x,y,label\n1,2,"atypical, ""tripolar"""\n3,4,mitotic figure\n');
  assert.deepEqual(figures.labels, ['atypical, "tripolar"', "mitotic figure"]);
  assert.deepEqual(Array.from(figures.labelIndex), [0, 1]);
});

Deno.test("parseFiguresCsv() accepts CRLF line ends (RFC 4180 §2.1) and header case", () => {
  const { figures } = parse(" X , Y \r\n1,2\r\n3,4\r\n");
  assert.equal(figures.xPx.length, 2);
});

Deno.test("parseFiguresCsv() strips a UTF-8 byte order mark", () => {
  const { figures, warnings } = parse("\ufeffx,y\n1,2\n");
  assert.equal(figures.xPx[0], 1);
  assert.deepEqual(warnings, []);
});

Deno.test("parseFiguresCsv() reads semicolon separators and decimal commas, with warnings", () => {
  const { figures, warnings } = parse("x;y;score\n10,5;20;0,75\n30;40;\n");
  assert.deepEqual(Array.from(figures.xPx), [10.5, 30]);
  assert.equal(figures.score[0], 0.75);
  assert.deepEqual(warnings, [
    `${FILE}: columns are separated by ";", not commas`,
    `${FILE}: read 2 number(s) with a decimal comma as decimals (first on line 2)`,
  ]);
});

Deno.test("parseFiguresCsv() explains a number it cannot read in a semicolon file", () => {
  assert.throws(() => parse("x;y\n1.234,5;20\n"), {
    name: "SyntaxError",
    message:
      /^Cannot read figures CSV "QVT-24-002\.figures\.csv": line 2: x "1\.234,5" is not a number; write numbers with a decimal point and no thousands separator$/,
  });
});

Deno.test("parseFiguresCsv() reads tab separators", () => {
  const { figures } = parse("x\ty\n1\t2\n");
  assert.equal(figures.yPx[0], 2);
});

Deno.test("parseFiguresCsv() converts micrometres with unequal mpp", () => {
  // hand calculation: 25 µm / 0.25 µm/px = 100 px; 50 µm / 0.5 µm/px = 100 px
  const { figures } = parse("x,y\n25,50\n", "um");
  assert.deepEqual([figures.xPx[0], figures.yPx[0]], [100, 100]);
});

Deno.test("parseFiguresCsv() ignores extra columns with a warning", () => {
  const { figures, warnings } = parse("id,x,y,reader\n7,1,2,reader-a\n");
  assert.equal(figures.xPx[0], 1);
  assert.deepEqual(warnings, [
    `${FILE}: ignored column(s) "id", "reader"; hotfield reads x, y, label, score`,
  ]);
});

Deno.test("parseFiguresCsv() names the header when x or y is missing", () => {
  assert.throws(() => parse("x_px,y_px\n1,2\n"), {
    name: "TypeError",
    message:
      /^Cannot read figures CSV "QVT-24-002\.figures\.csv": no "x" column in the header; the first line must name the columns x,y\[,label\]\[,score\]: found "x_px,y_px"$/,
  });
  assert.throws(() => parse("12,34\n56,78\n"), { name: "TypeError", message: /found "12,34"/ });
  assert.throws(() => parse("x,label\n1,a\n"), { name: "TypeError", message: /no "y" column/ });
  assert.throws(() => parse("x,y,X\n1,2,3\n"), {
    name: "TypeError",
    message: /names column "x" twice/,
  });
});

Deno.test("parseFiguresCsv() names the line of a non-numeric or empty x or y", () => {
  assert.throws(() => parse("x,y\n1,2\n3,abc\n"), {
    name: "SyntaxError",
    message:
      /^Cannot read figures CSV "QVT-24-002\.figures\.csv": line 3: y "abc" is not a number$/,
  });
  assert.throws(() => parse("x,y\n1,2\n\n,4\n"), {
    name: "SyntaxError",
    message: /line 4: x is empty$/,
  });
  assert.throws(() => parse("x,y\n1\n"), { name: "SyntaxError", message: /line 2: y is empty$/ });
});

Deno.test("parseFiguresCsv() rejects scores outside [0, 1] or not numeric", () => {
  assert.throws(() => parse("x,y,score\n1,2,87\n"), {
    name: "RangeError",
    message: /line 2: score 87 is outside \[0, 1\] \(a percentage\?/,
  });
  assert.throws(() => parse("x,y,score\n1,2,high\n"), {
    name: "SyntaxError",
    message: /line 2: score "high" is not a number$/,
  });
});

Deno.test("parseFiguresCsv() rejects an empty file and broken quoting", () => {
  assert.throws(() => parse(""), {
    name: "SyntaxError",
    message: /^Cannot read figures CSV "QVT-24-002\.figures\.csv": the file is empty \(0 bytes\)$/,
  });
  assert.throws(() => parse('x,y,label\n1,2,"open\n3,4,b\n'), {
    name: "SyntaxError",
    message: /not valid CSV \(RFC 4180\)/,
  });
});

Deno.test("parseFiguresCsv() warns about a header with no rows", () => {
  const { figures, warnings } = parse("x,y\n");
  assert.equal(figures.xPx.length, 0);
  assert.deepEqual(warnings, [`${FILE}: the file has a header but no figure rows`]);
});

/**
 * Bland–Altman agreement on the worked example of Bland JM, Altman DG.
 * Statistical methods for assessing agreement between two methods of
 * clinical measurement. Lancet 1986;327(8476):307-310,
 * doi:10.1016/S0140-6736(86)90837-8, Table 1: peak expiratory flow rate
 * (l/min) of 17 subjects, first reading with the Wright meter and with the
 * mini Wright meter. The paper reports a mean difference of −2.1 l/min
 * (Wright − mini), SD 38.8, and limits −79.7 to 75.5 using 2 SD. The 34
 * values were read in several public copies of the table that agree with
 * each other (V2).
 */

import { blandAltman } from "../../lib/stats/bland_altman.ts";
import { assertAlmostEquals, assertEquals, assertThrows } from "../compare/_assert.ts";

export const WRIGHT = [
  494,
  395,
  516,
  434,
  476,
  557,
  413,
  442,
  650,
  433,
  417,
  656,
  267,
  478,
  178,
  423,
  427,
];
export const MINI = [
  512,
  430,
  520,
  428,
  500,
  600,
  364,
  380,
  658,
  445,
  432,
  626,
  260,
  477,
  259,
  350,
  451,
];

Deno.test("blandAltman() reproduces the Lancet 1986 worked example", () => {
  // Differences here are mini − Wright (B − A): the paper's sign reversed.
  const r = blandAltman(WRIGHT, MINI);
  assertEquals(r.n, 17);
  // Hand calculation: the differences sum to 36, so the bias is 36/17 = 2.1176.
  assertAlmostEquals(r.bias!, 36 / 17, 1e-12);
  // The paper prints one decimal: bias 2.1 (sign reversed), SD 38.8.
  assertAlmostEquals(r.bias!, 2.1, 0.05, "paper, one decimal");
  assertAlmostEquals(r.sd!, 38.8, 0.05, "paper, one decimal");
  // The paper's limits use 2 SD: −79.7 to 75.5 for Wright − mini, i.e. −75.5 to 79.7 here.
  assertAlmostEquals(r.bias! - 2 * r.sd!, -75.5, 0.1, "paper's lower limit, reversed");
  assertAlmostEquals(r.bias! + 2 * r.sd!, 79.7, 0.1, "paper's upper limit, reversed");
  // hotfield's limits use 1.96 SD.
  assertAlmostEquals(r.lower!, r.bias! - 1.96 * r.sd!, 1e-12);
  assertAlmostEquals(r.upper!, r.bias! + 1.96 * r.sd!, 1e-12);
});

Deno.test("blandAltman() with fewer than two pairs, and bad input", () => {
  assertEquals(blandAltman([], []), { n: 0, bias: null, sd: null, lower: null, upper: null });
  assertEquals(blandAltman([3], [5]), { n: 1, bias: 2, sd: null, lower: null, upper: null });
  assertThrows(() => blandAltman([1, 2], [1]), RangeError, "equal lengths");
  assertThrows(() => blandAltman([1, NaN], [1, 2]), RangeError, "pair 1");
});

/**
 * The palette's text colours against the backgrounds they are drawn on, in the light and the
 * dark scheme of app/globals.css: WCAG 2.1 success criterion 1.4.3 (contrast minimum, AA) asks
 * 4.5:1 for text; relative luminance and the ratio as WCAG 2.1 defines them (sRGB, 0.03928
 * threshold). Silt is a border colour: 1.4.11 (non-text contrast) asks 3:1.
 */
import { readFileSync } from "node:fs";
import { describe, expect, test } from "vitest";

const css = readFileSync(new URL("../../app/globals.css", import.meta.url), "utf8");

function schemeVars(block: string): Record<string, string> {
  return Object.fromEntries(
    [...block.matchAll(/--t-([a-z-]+):\s*(#[0-9a-f]{6})/gi)].map((m) => [m[1]!, m[2]!]),
  );
}
const light = schemeVars(
  css.slice(css.indexOf(":root {"), css.indexOf("@media (prefers-color-scheme: dark)")),
);
const dark = schemeVars(
  css.slice(css.indexOf("@media (prefers-color-scheme: dark)"), css.indexOf("@layer base")),
);

function luminance(hex: string): number {
  const [r, g, b] = hex
    .slice(1)
    .match(/../g)!
    .map((h) => parseInt(h, 16) / 255)
    .map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}
function ratio(a: string, b: string): number {
  const [x, y] = [luminance(a), luminance(b)];
  return (Math.max(x, y) + 0.05) / (Math.min(x, y) + 0.05);
}

const TEXT = [
  "ink",
  "ink-soft",
  "silt-ink",
  "channel",
  "channel-deep",
  "clay-ink",
  "ochre-ink",
  "reed-ink",
  "slate-ink",
];
const GROUNDS = ["sand", "surface", "sand-deep", "stripe", "channel-wash", "shallows"];
const WASHES = ["clay", "ochre", "reed", "slate"].map((c) => [`${c}-ink`, `${c}-wash`] as const);
// a filled button: the surface colour written on the colour (white on channel in the light scheme)
const FILLED = ["channel", "channel-deep", "clay", "ink"].map((c) => ["surface", c] as const);

describe.each([
  ["light", light],
  ["dark", dark],
])("the %s scheme", (_name, p) => {
  test("defines every colour the other scheme defines", () => {
    expect(Object.keys(p).sort()).toEqual(Object.keys(light).sort());
  });
  const pairs = [
    ...TEXT.flatMap((t) => GROUNDS.map((g) => [t, g] as const)),
    ...WASHES,
    ...WASHES.map(([, w]) => ["ink", w] as const),
    ...FILLED,
  ];
  test.each(pairs)("%s text on %s passes AA (4.5:1)", (fg, bg) => {
    expect(ratio(p[fg]!, p[bg]!)).toBeGreaterThanOrEqual(4.5);
  });
  test.each(["sand", "surface"])("silt borders on %s pass 3:1", (bg) => {
    expect(ratio(p.silt!, p[bg]!)).toBeGreaterThanOrEqual(3);
  });
});

test("the ratio formula against WCAG's own end points: black on white is 21:1, a colour on itself 1:1", () => {
  expect(ratio("#000000", "#ffffff")).toBeCloseTo(21, 6);
  expect(ratio("#1f6f78", "#1f6f78")).toBe(1);
});

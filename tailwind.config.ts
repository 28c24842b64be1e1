import type { Config } from "tailwindcss";

/** A palette colour: its custom property (app/globals.css), redefined for the dark scheme. */
const v = (name: string) => `var(--t-${name})`;

/**
 * The "estuary" palette (values in app/globals.css, light and dark). Each colour that also carries meaning has a
 * `wash` (soft background) and, where the base fails WCAG AA as text on sand, an `ink`
 * shade that passes (contrast ratios checked against sand and the surface in both schemes).
 */
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        // "white" is the surface a panel, a row or an input is drawn on: white in the light scheme
        white: v("surface"),
        ink: { DEFAULT: v("ink"), soft: v("ink-soft") },
        channel: { DEFAULT: v("channel"), deep: v("channel-deep"), wash: v("channel-wash") },
        shallows: v("shallows"),
        sand: { DEFAULT: v("sand"), deep: v("sand-deep") },
        // silt as a border passes 3:1 (3.51 on sand); as text use silt-ink (5.41 on sand)
        silt: { DEFAULT: v("silt"), ink: v("silt-ink"), line: v("silt-line") },
        reed: { DEFAULT: v("reed"), ink: v("reed-ink"), wash: v("reed-wash") },
        clay: { DEFAULT: v("clay"), ink: v("clay-ink"), wash: v("clay-wash") },
        // ochre as text is 4.19 on sand (fails AA): text uses ochre-ink (5.76)
        ochre: { DEFAULT: v("ochre"), ink: v("ochre-ink"), wash: v("ochre-wash") },
        slate: { DEFAULT: v("slate"), ink: v("slate-ink"), wash: v("slate-wash") },
      },
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["ui-monospace", "SFMono-Regular", "Menlo", "Consolas", "monospace"],
      },
      // A compact scale for long, table-heavy sessions: 14 px body, 13 px tables, generous leading.
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem", letterSpacing: "0.02em" }],
        xs: ["0.75rem", { lineHeight: "1.125rem" }],
        sm: ["0.8125rem", { lineHeight: "1.25rem" }],
        base: ["0.875rem", { lineHeight: "1.375rem" }],
        md: ["0.9375rem", { lineHeight: "1.5rem" }],
        lg: ["1.0625rem", { lineHeight: "1.5rem" }],
        xl: ["1.25rem", { lineHeight: "1.75rem", letterSpacing: "-0.005em" }],
        "2xl": ["1.5rem", { lineHeight: "2rem", letterSpacing: "-0.01em" }],
      },
      borderRadius: { sm: "3px", DEFAULT: "4px", md: "6px" },
      maxWidth: { page: "80rem" },
    },
  },
};

export default config;

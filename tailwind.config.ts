import type { Config } from "tailwindcss";

/**
 * The "estuary" palette. Each colour that also carries meaning has a
 * `wash` (soft background) and, where the base fails WCAG AA as text on sand, an `ink`
 * shade that passes (contrast ratios checked against #F7F4EE and #FFFFFF).
 */
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: "#12262E", soft: "#2B3F47" },
        channel: { DEFAULT: "#1F6F78", deep: "#185A62", wash: "#E9F3F2" },
        shallows: "#D8ECEB",
        sand: { DEFAULT: "#F7F4EE", deep: "#EFEADF" },
        // silt as a border passes 3:1 (3.51 on sand); as text use silt-ink (5.41 on sand)
        silt: { DEFAULT: "#8A8170", ink: "#6B6354", line: "#E2DCCF" },
        reed: { DEFAULT: "#4F7A32", ink: "#3F6428", wash: "#E4EDDC" },
        clay: { DEFAULT: "#A63D24", ink: "#A63D24", wash: "#F6E4DE" },
        // ochre as text is 4.19 on sand (fails AA): text uses ochre-ink (5.76)
        ochre: { DEFAULT: "#A8660B", ink: "#8A5309", wash: "#F8EBD3" },
        slate: { DEFAULT: "#4A5D78", ink: "#4A5D78", wash: "#E4E9F0" },
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

import type { Config } from "tailwindcss";

// Chalkwing's own design system: a slate "board" for teaching views, warm "paper" for records.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        board: { 950: "#0e1522", 900: "#152033", 800: "#1d2b43", 700: "#2a3b58", 600: "#3b4f72" },
        chalk: { DEFAULT: "#f4f1e8", dim: "#c9cdd6", faint: "#8f99ab" },
        paper: { DEFAULT: "#fbf8f1", deep: "#f3eee2", edge: "#e2dac6" },
        ink: { DEFAULT: "#1c2230", soft: "#414a5c", faint: "#5f6878" },
        wing: { 50: "#eef5fb", 100: "#d6e6f4", 500: "#2f6fa6", 600: "#235a8a", 700: "#1b476e", 800: "#14364f" },
        stable: { 100: "#d3f0ec", 500: "#1f9c8c", 700: "#146b60" },
        unstable: { 100: "#fcebcc", 500: "#d48a16", 700: "#8f5a06" },
        solid: { 100: "#dcf1de", 600: "#2e7d3a", 800: "#1d5426" },
        shaky: { 100: "#fcefcf", 600: "#a86a05", 800: "#6e4503" },
        notyet: { 100: "#fbe0e6", 600: "#b8324f", 800: "#7d1c32" },
      },
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      fontSize: {
        caption: ["0.8125rem", { lineHeight: "1.25rem" }],
        body: ["0.9375rem", { lineHeight: "1.5rem" }],
        lead: ["1.125rem", { lineHeight: "1.75rem" }],
        title: ["1.5rem", { lineHeight: "2rem", fontWeight: "650" }],
        display: ["2rem", { lineHeight: "2.5rem", fontWeight: "700" }],
        projector: ["1.75rem", { lineHeight: "2.25rem" }],
      },
      spacing: { gutter: "1.25rem", touch: "2.75rem" },
      borderRadius: { card: "0.625rem" },
      boxShadow: { card: "0 1px 2px rgba(28,34,48,0.08), 0 1px 1px rgba(28,34,48,0.04)" },
    },
  },
};

export default config;

import type { Config } from "tailwindcss";

// Fieldtide palette: names are ours. Contrast of ink-900 / tide-700 / storm-700 on paper-50
// passes WCAG AA for body text.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: { 50: "#f2f4f7", 100: "#e2e7ee", 200: "#c5cfdc", 300: "#9aaabf", 400: "#6b7f99", 500: "#4d6079", 600: "#3b4b61", 700: "#2d3a4c", 800: "#212b39", 900: "#161d27" },
        paper: { 50: "#fbfaf6", 100: "#f5f2ea", 200: "#ebe5d6" },
        tide: { 50: "#eefaf8", 100: "#d2f1ec", 300: "#7fd3c6", 500: "#1f9e8e", 600: "#137f73", 700: "#0f665d", 800: "#0d524b" },
        flare: { 50: "#fff8eb", 100: "#feecc7", 300: "#fbc35a", 500: "#e89410", 600: "#c2740a", 700: "#9a580c" },
        storm: { 50: "#fdf0f0", 100: "#f9d7d7", 500: "#c23a3a", 600: "#a42a2a", 700: "#861f22" },
        moss: { 50: "#f1f8ef", 100: "#dcedd6", 500: "#4f8a3c", 600: "#3e702f", 700: "#305726" },
      },
      fontFamily: {
        sans: ["var(--font-inter)", "system-ui", "sans-serif"],
      },
    },
  },
};

export default config;

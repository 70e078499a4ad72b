import type { Config } from "tailwindcss";

/**
 * Chainwright's palette: paper-toned surfaces, graphite text, one accent (a deep sea-glass
 * teal of our own), and three muted status tones that only ever reinforce a word and a shape.
 */
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        paper: {
          DEFAULT: "#f5f3ee",
          raised: "#fbfaf7",
          sunk: "#ebe8e1",
          rule: "#d6d2c8",
        },
        graphite: {
          950: "#1b1d21",
          900: "#24272c",
          700: "#3c4047",
          500: "#5a5f67",
          // 4.6:1 on paper-sunk, the darkest surface quiet text sits on (WCAG AA asks 4.5:1; axe checks it)
          400: "#63676f",
          300: "#a1a5ab",
        },
        accent: {
          50: "#e8f1f0",
          100: "#cfe3e1",
          300: "#7fb3ae",
          600: "#1e6d6a",
          700: "#175755",
          800: "#114341",
        },
        status: {
          ok: "#3c6e4a",
          tight: "#946019",
          clip: "#9b3a31",
        },
      },
      fontFamily: {
        sans: ["var(--font-geist-sans)", "ui-sans-serif", "system-ui", "sans-serif"],
        mono: ["var(--font-geist-mono)", "ui-monospace", "monospace"],
      },
      borderRadius: {
        card: "6px",
      },
      boxShadow: {
        card: "0 1px 0 rgba(36, 39, 44, 0.06), 0 1px 3px rgba(36, 39, 44, 0.06)",
      },
    },
  },
};

export default config;

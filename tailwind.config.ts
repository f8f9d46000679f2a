// Soundings' own theme: quiet chart colours. Text pairs used on screens were checked for
// WCAG AA (≥ 4.5:1): slate-600 and sea-600 on paper, white on sea-600, coral-600 on paper
// and on coral-50.
import type { Config } from "tailwindcss";

export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        // Deep ink-navy: the viewing surface for images and clips (950), and body text.
        ink: {
          50: "#eef3f7",
          100: "#d9e3ec",
          200: "#b5c6d5",
          300: "#8aa3b9",
          400: "#5f7f9b",
          500: "#43627f",
          600: "#324d66",
          700: "#253b50",
          800: "#1a2c3d",
          900: "#122230",
          950: "#0c1a26",
        },
        // Paper-white work surfaces for forms and tables.
        paper: {
          DEFAULT: "#fbfaf7",
          50: "#fefdfb",
          100: "#fbfaf7",
          200: "#f4f2ec",
          300: "#e9e5db",
        },
        // Sea teal: primary actions, links and focus.
        sea: {
          50: "#eef7f6",
          100: "#d5ecea",
          200: "#a9d8d4",
          300: "#74bdb8",
          400: "#3f9e99",
          500: "#1f8582",
          600: "#0f6e70",
          700: "#0b5d5f",
          800: "#0a4a4c",
          900: "#083a3c",
        },
        sand: {
          50: "#faf7f0",
          100: "#f3ede0",
          200: "#e7dcc6",
          300: "#d6c5a3",
          400: "#bfa77c",
          500: "#a38a5c",
          600: "#85704a",
          700: "#67573a",
          800: "#4a3f2b",
          900: "#30291c",
        },
        slate: {
          50: "#f5f7f8",
          100: "#e9edf0",
          200: "#d9dee3",
          300: "#bcc5cd",
          400: "#9aa7b3",
          500: "#6b7885",
          600: "#4b5a68",
          700: "#3a4753",
          800: "#29333d",
          900: "#1b232b",
        },
        // Coral is reserved for problems: failed, disagreement, overdue, errors.
        coral: {
          50: "#fdf0ec",
          100: "#fadcd3",
          200: "#f4b7a6",
          300: "#ec8d74",
          400: "#dd6a4d",
          500: "#c8523a",
          600: "#b3402e",
          700: "#923324",
          800: "#70281d",
          900: "#4f1d15",
        },
      },
      fontFamily: {
        sans: ['"Noto Sans"', "system-ui", "sans-serif"],
      },
    },
  },
} satisfies Config;

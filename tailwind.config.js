// Emberline's palette and type scale: calm neutrals, one warm accent, and a colour-blind-safe
// series palette (Okabe & Ito, 2008) for charts. Loaded by app/globals.css through @config.
/** @type {import('tailwindcss').Config} */
module.exports = {
  theme: {
    extend: {
      // Where the workspace's sidebar appears; below it the areas sit behind a menu button.
      screens: {
        sidebar: "56.25rem",
      },
      colors: {
        ember: {
          50: "#fdf5ef",
          100: "#f9e4d3",
          200: "#f1c29f",
          300: "#e69a66",
          400: "#d9763d",
          500: "#c45a22",
          600: "#a8461a",
          700: "#863618",
          800: "#6a2d19",
          900: "#562717",
        },
        ink: {
          50: "#f6f6f4",
          100: "#ebeae6",
          200: "#d7d5ce",
          300: "#b8b5ab",
          400: "#8f8b7f",
          500: "#6f6b60",
          600: "#57544b",
          700: "#43413a",
          800: "#2c2b27",
          900: "#1c1b18",
          950: "#121210",
        },
        series: {
          orange: "#E69F00",
          sky: "#56B4E9",
          green: "#009E73",
          yellow: "#F0E442",
          blue: "#0072B2",
          vermillion: "#D55E00",
          purple: "#CC79A7",
          black: "#000000",
        },
        verdict: {
          present: "#0f766e",
          possible: "#a16207",
          absent: "#57534e",
        },
      },
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      fontSize: {
        "2xs": ["0.6875rem", { lineHeight: "1rem" }],
        xs: ["0.75rem", { lineHeight: "1.05rem" }],
        sm: ["0.8125rem", { lineHeight: "1.2rem" }],
        base: ["0.875rem", { lineHeight: "1.35rem" }],
        lg: ["1rem", { lineHeight: "1.5rem" }],
        xl: ["1.25rem", { lineHeight: "1.75rem" }],
        "2xl": ["1.5rem", { lineHeight: "2rem" }],
      },
    },
  },
};

import type { Config } from "tailwindcss";

// Seedplot's own palette: loam (deep green-brown ink), sprout (action green), husk (warm neutral
// backgrounds), marigold (highlights) and beet (errors). Text colours meet WCAG AA on husk-50 and white.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        loam: { 50: "#f3f5f1", 100: "#e1e7dc", 300: "#9aab8f", 500: "#4f6446", 700: "#2f3f2a", 900: "#1b2618" },
        sprout: { 50: "#eef8ef", 100: "#d3eed6", 300: "#7fc78a", 500: "#2f8a43", 600: "#23743a", 700: "#1b5c2e" },
        husk: { 50: "#fbf9f4", 100: "#f4efe3", 200: "#e8dfca", 400: "#c2b08a" },
        marigold: { 100: "#fdf0d5", 400: "#f0b03d", 600: "#b5740d", 800: "#6e4606" },
        beet: { 50: "#fdf0f2", 100: "#f9d9df", 600: "#b3203f", 700: "#8f1832" },
        sky: { 100: "#dcecf7", 600: "#1f6391", 800: "#143f5d" },
      },
      fontFamily: {
        sans: ["var(--font-inter)", "ui-sans-serif", "system-ui", "sans-serif"],
      },
    },
  },
};

export default config;

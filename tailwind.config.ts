import type { Config } from 'tailwindcss';

// Stochos palette: a cool slate neutral and a single teal-ink accent.
// Chart colours live in lib/core/charts/palette.ts (colour-blind-safe set).
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './pages/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { 50: '#f5f7f8', 100: '#e8ecef', 200: '#d2d9de', 300: '#aab6bf', 400: '#7b8b97', 500: '#5a6b78', 600: '#445461', 700: '#33414c', 800: '#222d36', 900: '#141c22' },
        accent: { 50: '#eef8f6', 100: '#d3eeea', 200: '#a6ddd5', 300: '#6fc3b8', 400: '#3ba597', 500: '#1f887b', 600: '#176d63', 700: '#14574f', 800: '#124641', 900: '#0f3a36' },
        warn: { 50: '#fff7ed', 600: '#b45309', 700: '#92400e' },
        danger: { 50: '#fef2f2', 600: '#b91c1c', 700: '#991b1b' },
      },
      fontFamily: {
        sans: ['var(--font-sans)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
    },
  },
};
export default config;

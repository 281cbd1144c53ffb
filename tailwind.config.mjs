/** Crestline's own theme tokens. Loaded from src/styles/global.css with @config. */
/** @type {import('tailwindcss').Config} */
export default {
  content: ['./src/**/*.{astro,ts,tsx}'],
  theme: {
    extend: {
      colors: {
        // Deep slate-blue for text and the navigation rail.
        ink: {
          50: '#f4f6f9', 100: '#e6eaf0', 200: '#c9d1dd', 300: '#9dabbf', 400: '#6c7f99',
          500: '#4c6079', 600: '#394b62', 700: '#2c3b4f', 800: '#1f2b3b', 900: '#141d29',
        },
        // The brand colour: a cool sea-green ("the line of the crest").
        crest: {
          50: '#eefaf7', 100: '#d4f2ea', 200: '#a9e4d6', 300: '#74cfbc', 400: '#43b39f',
          500: '#279784', 600: '#1b7a6c', 700: '#186258', 800: '#164e48', 900: '#12403b',
        },
        // A warm accent for highlights and the current item.
        dune: { 50: '#fdf8ef', 100: '#f9ecd2', 300: '#eec27a', 500: '#d9922d', 700: '#a15f19' },
        // Flag colours: above and below a reference range, and info.
        high: { 50: '#fdf1ef', 200: '#f5c4bb', 600: '#c0422b', 800: '#8a2a1a' },
        low: { 50: '#eef4fd', 200: '#bcd3f3', 600: '#2d63b8', 800: '#1d4180' },
        paper: '#fbfcfd',
      },
      fontFamily: {
        sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
      },
      borderRadius: {
        card: '0.75rem',
      },
      boxShadow: {
        card: '0 1px 2px rgba(20, 29, 41, 0.06), 0 1px 6px rgba(20, 29, 41, 0.05)',
      },
    },
  },
};

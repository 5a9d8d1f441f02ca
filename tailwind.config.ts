import type { Config } from 'tailwindcss';

// Legwork's own palette: slate blue-greys with a signal amber for holds and a deep teal accent.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"IBM Plex Sans Variable"', 'system-ui', 'sans-serif'],
        mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace'],
      },
      colors: {
        ink: {
          50: '#f4f6f8',
          100: '#e3e8ee',
          200: '#c5cfd9',
          400: '#5b6b7e',
          500: '#506175',
          600: '#46586c',
          700: '#334457',
          800: '#22303e',
          900: '#141d26',
        },
        tealdeep: { 500: '#0f766e', 600: '#0b5f59', 700: '#084a45' },
        signal: { 400: '#f2a93b', 600: '#8f5405' },
        stop: { 500: '#c2412d', 700: '#8e2a1c' },
      },
    },
  },
} satisfies Config;

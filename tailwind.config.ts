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
        // The use scale (a budget use within, near or over its limit; a finding's tier): teal, amber,
        // red. Amber and red mean nothing else; teal is also the accent of links, focus rings and the
        // current page in the navigation, never of a state.
        tealdeep: { 500: '#0f766e', 600: '#0b5f59', 700: '#084a45' },
        signal: { 400: '#f2a93b', 600: '#8f5405' },
        stop: { 500: '#c2412d', 700: '#8e2a1c' },
        // The state scale (where a run or a release is in its life), kept apart from the use scale
        // so a state badge is never read as a budget verdict: indigo from waiting to done, plum for a
        // failure of the machinery, ink for what is retired. Each state also carries a mark shape.
        lane: { 50: '#f0f1fb', 200: '#c9ccef', 500: '#5a5fb8', 700: '#3a3d86', 900: '#24265a' },
        plum: { 500: '#8c2f6f', 700: '#6b2054' },
      },
    },
  },
} satisfies Config;

import type { Config } from 'tailwindcss'

// Phaseloom's own tokens. Phase colours are data (shared/phase-colours.ts), not theme:
// they depend on the user's regional convention.
export default {
  content: [],
  theme: {
    extend: {
      colors: {
        ink: {
          DEFAULT: '#26303b',
          soft: '#4a5562',
          faint: '#8a939e',
        },
        paper: {
          DEFAULT: '#f7f2e8',
          raised: '#fffcf5',
          edge: '#e4dccb',
        },
        copper: {
          DEFAULT: '#b4643a',
          dark: '#8a4a29',
          light: '#e9c2a6',
        },
        caution: {
          DEFAULT: '#b7791f',
          bg: '#fdf1d8',
        },
        danger: {
          DEFAULT: '#b3261e',
          bg: '#fbe3e0',
        },
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
        mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace'],
      },
    },
  },
} satisfies Config

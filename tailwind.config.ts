import type { Config } from 'tailwindcss';

/**
 * Sowright's own design tokens. Warm paper, dark ink and a clay accent: a look of our own,
 * readable in a bright office and on a laptop in a truck cab.
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: '#f6f4ef', raised: '#fffdf8', sunk: '#ebe7de' },
        ink: { DEFAULT: '#1f2630', soft: '#4a5462', faint: '#7b8491', line: '#d6d1c6' },
        clay: {
          50: '#fbf1ec',
          100: '#f5dccf',
          300: '#e0a184',
          500: '#b8582f',
          600: '#9e4624',
          700: '#7f371c',
        },
        slate: { 700: '#2c3a4a', 800: '#222d3a', 900: '#18212b' },
        ok: { DEFAULT: '#2d6b5a', soft: '#dcefe8' },
        caution: { DEFAULT: '#8a6210', soft: '#f6ecd2' },
        danger: { DEFAULT: '#9a2f2f', soft: '#f6dede' },
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
        mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace'],
      },
      fontSize: {
        xs: ['0.75rem', { lineHeight: '1rem' }],
        sm: ['0.8125rem', { lineHeight: '1.25rem' }],
        base: ['0.9375rem', { lineHeight: '1.5rem' }],
        lg: ['1.125rem', { lineHeight: '1.6rem' }],
        xl: ['1.375rem', { lineHeight: '1.8rem' }],
        '2xl': ['1.75rem', { lineHeight: '2.2rem' }],
      },
      spacing: {
        gutter: '1.25rem',
        rail: '15rem',
      },
      borderRadius: {
        card: '0.375rem',
      },
      boxShadow: {
        card: '0 1px 0 rgba(31,38,48,0.06), 0 1px 3px rgba(31,38,48,0.08)',
      },
    },
  },
} satisfies Config;

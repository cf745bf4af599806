// Worldsheet's visual identity: drafting-paper neutrals, one deep teal for action, and signal
// colours reserved for pass, fail and caution. Every text pairing below meets WCAG 2.2 AA
// (4.5:1 for body text); tests/ui/contrast.test.ts recomputes the ratios from these tokens.
import type { Config } from 'tailwindcss';

export const tokens = {
  paper: '#f6f5f0',
  surface: '#ffffff',
  ink: '#17212b',
  'ink-muted': '#4b5563',
  rule: '#d6d1c4',
  'rule-strong': '#7d7768',
  accent: '#0b5a61',
  'accent-hover': '#08454a',
  'accent-soft': '#e3f0f0',
  pass: '#1d6a33',
  'pass-soft': '#e6f2e8',
  fail: '#a3242b',
  'fail-soft': '#fae9e9',
  caution: '#6f4500',
  'caution-soft': '#fff3d4',
  'caution-rule': '#c2861a',
  focus: '#1f5fd1',
} as const;

const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: tokens,
      fontFamily: {
        sans: ['var(--font-text)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
      fontSize: {
        // A modular scale (ratio ≈ 1.2) on a 4 px baseline.
        xs: ['0.75rem', { lineHeight: '1rem' }],
        sm: ['0.875rem', { lineHeight: '1.25rem' }],
        base: ['1rem', { lineHeight: '1.5rem' }],
        lg: ['1.125rem', { lineHeight: '1.625rem' }],
        xl: ['1.375rem', { lineHeight: '1.75rem' }],
        '2xl': ['1.75rem', { lineHeight: '2.125rem' }],
        '3xl': ['2.25rem', { lineHeight: '2.625rem' }],
      },
      spacing: {
        gutter: '1.5rem',
        rail: '15rem',
      },
      maxWidth: {
        sheet: '72rem',
        prose: '42rem',
      },
      borderRadius: {
        DEFAULT: '3px',
      },
    },
  },
};

export default config;

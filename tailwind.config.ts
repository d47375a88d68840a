import type { Config } from 'tailwindcss';

// Colours are CSS variables so the night view can swap every one of them at once.
const v = (name: string) => `rgb(var(--c-${name}) / <alpha-value>)`;

const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        paper: v('paper'),
        panel: v('panel'),
        ink: v('ink'),
        muted: v('muted'),
        rule: v('rule'),
        accent: v('accent'),
        'accent-ink': v('accent-ink'),
        ok: v('ok'),
        wait: v('wait'),
        revise: v('revise'),
        bad: v('bad'),
      },
      fontFamily: {
        sans: ['var(--font-text)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-figures)', 'ui-monospace', 'monospace'],
      },
      maxWidth: { page: '84rem' },
      borderRadius: { card: '6px' },
    },
  },
};

export default config;

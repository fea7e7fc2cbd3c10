import type { Config } from 'tailwindcss';

/**
 * Coretrail's palette: a warm record card on a workshop-grey ground, one deep petrol hue for
 * actions, and state colours that always travel with a word and a shape (see components/ui/badge).
 * Every text pairing used below was checked for at least 4.5:1 contrast; `ink-faint` reaches that
 * only on `card`/`sunk`, so it is not used on `ground`.
 */
const palette = {
  transparent: 'transparent',
  current: 'currentColor',
  white: '#ffffff',
  black: '#000000',
  ground: '#d8d4cb', // workshop grey, the page behind the cards
  'ground-deep': '#c9c4b9',
  card: '#fbf9f4', // warm off-white record card
  sunk: '#f3efe6', // table heads, inset panels
  field: '#fffefa', // input wells
  rule: '#d3cdc1', // thin rules between rows and sections
  'rule-strong': '#8c877b', // input and outline borders (≥3:1 on card)
  ink: '#1d2124',
  'ink-soft': '#4b5055',
  'ink-faint': '#5c6166',
  accent: '#0f5362', // petrol: the one colour for actions
  'accent-strong': '#0a3f4b',
  'accent-tint': '#e2edee',
  ok: '#1f6a3d',
  'ok-tint': '#e5f0e6',
  bad: '#a3262a',
  'bad-tint': '#f8e7e3',
  hold: '#7a4f00',
  'hold-tint': '#f6ead0',
  wait: '#3f4a78',
  'wait-tint': '#e6e8f2',
};

export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    colors: palette,
    extend: {
      fontFamily: {
        sans: ['"IBM Plex Sans"', 'system-ui', 'sans-serif'],
        mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace'],
      },
      borderRadius: { card: '6px', control: '4px' },
      boxShadow: { card: '0 1px 0 rgba(29, 33, 36, 0.08), 0 1px 3px rgba(29, 33, 36, 0.06)' },
      // wide enough that a 1440–1920 px desk uses its width for tables; capped so lines stay readable
      maxWidth: { page: '1920px' },
    },
  },
} satisfies Config;

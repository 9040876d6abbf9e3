import type { Config } from 'tailwindcss';

// Colours are chosen for WCAG AA contrast on white (ink ≥ 7:1, muted ≥ 4.5:1).
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['var(--font-inter)', 'system-ui', 'sans-serif'],
      },
      colors: {
        ink: '#172033',
        muted: '#4a5568',
        line: '#cbd2dc',
        brand: { DEFAULT: '#1f5f8b', dark: '#174a6d', light: '#e6f0f7' },
        danger: { DEFAULT: '#a61b1b', light: '#fdecec' },
        caution: { DEFAULT: '#7a4b00', light: '#fff4de' },
        ok: { DEFAULT: '#1d6b3a', light: '#e7f5ec' },
      },
    },
  },
};

export default config;

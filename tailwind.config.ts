import type { Config } from 'tailwindcss';

// Panelpoint's look: warm paper ground, graphite ink, one deep blue-green accent.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: '#fbf8f3', raised: '#ffffff', sunk: '#f3efe7', line: '#e2dcd0' },
        ink: { DEFAULT: '#2b2d2f', soft: '#55585c', faint: '#8a8d90' },
        accent: { DEFAULT: '#12605a', hover: '#0d4c47', soft: '#d9ebe8' },
        tension: '#1b8a82',
        compression: '#c47f12',
        danger: '#a33a2b',
      },
      fontFamily: {
        sans: ['Inter', 'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari', 'Noto Sans SC', 'Noto Sans KR', 'Noto Sans Thai', 'system-ui', 'sans-serif'],
      },
    },
  },
} satisfies Config;

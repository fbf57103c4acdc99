import type { Config } from 'tailwindcss';

// Panelpoint's visual language (docs/visual-language.md): a drafting table of warm paper, sheets
// and calc pads laid on it with ruled edges, graphite ink, one deep blue-green accent. The token
// names stay the ones the pages already use, so every page follows a change made here.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        // table: the ground; raised: a sheet laid on it; sunk: the calc pad; line: the ruled edge.
        paper: { DEFAULT: '#f4f1ea', raised: '#fdfcf9', sunk: '#eceee8', line: '#cfc8ba', rule: '#8a8275' },
        // Graphite, in three weights of pencil. Faint is the lightest that still reads as text (≥ 4.5:1).
        ink: { DEFAULT: '#26292b', soft: '#4f5357', faint: '#65696c' },
        accent: { DEFAULT: '#0f5a55', hover: '#0a4541', soft: '#dbe8e4' },
        // Member forces: tension a blue-green lighter than the accent, compression burnt umber.
        // Drawings also tell them apart by line (tension thin and continuous, compression heavy).
        tension: '#17706a',
        compression: '#8a4b0f',
        danger: '#9b2f22',
      },
      // Square sheets: at most 2 px on any corner the pages round; circles stay circles.
      borderRadius: {
        none: '0',
        xs: '1px',
        sm: '1px',
        DEFAULT: '2px',
        md: '2px',
        lg: '2px',
        xl: '2px',
        '2xl': '2px',
      },
      // No drop shadows: what floats over the page (a popover, a menu) gets a second, darker rule instead.
      boxShadow: {
        xs: 'none',
        sm: 'none',
        DEFAULT: 'none',
        md: '0 0 0 1px #4f5357',
        lg: '0 0 0 1px #4f5357',
        xl: '0 0 0 1px #4f5357',
      },
      fontFamily: {
        // Korean before Traditional Chinese: the latter's subsets also hold 49 Hangul syllables,
        // which would otherwise print in a Chinese face amid Korean text.
        sans: ['Inter', 'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari', 'Noto Sans SC', 'Noto Sans JP', 'Noto Sans KR', 'Noto Sans TC', 'Noto Sans Thai', 'system-ui', 'sans-serif'],
      },
    },
  },
} satisfies Config;

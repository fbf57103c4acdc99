import '@fontsource/inter/400.css';
import '@fontsource/inter/500.css';
import '@fontsource/inter/600.css';
import '@fontsource/inter/700.css';
// Shipped fallbacks for tags and names in scripts Inter lacks; each face loads only when used.
import '@fontsource/noto-sans/400.css';
import '@fontsource/noto-sans/700.css';
import '@fontsource/noto-sans-arabic/400.css';
import '@fontsource/noto-sans-arabic/700.css';
import '@fontsource/noto-sans-hebrew/400.css';
import '@fontsource/noto-sans-hebrew/700.css';
import '@fontsource/noto-sans-devanagari/400.css';
import '@fontsource/noto-sans-devanagari/700.css';
// Chinese, Japanese, Korean and Thai: some hundred faces per CJK package, each with its
// unicode-range, so the browser fetches only the few subsets a page's characters fall in. The
// Japanese and Traditional Chinese packages hold the rare kana and some 4 600 Han characters the
// Simplified Chinese and Korean subsets leave out (tests/sheet-fonts.test.ts measures it).
import '@fontsource/noto-sans-sc/400.css';
import '@fontsource/noto-sans-sc/700.css';
import '@fontsource/noto-sans-jp/400.css';
import '@fontsource/noto-sans-jp/700.css';
import '@fontsource/noto-sans-tc/400.css';
import '@fontsource/noto-sans-tc/700.css';
import '@fontsource/noto-sans-kr/400.css';
import '@fontsource/noto-sans-kr/700.css';
import '@fontsource/noto-sans-thai/400.css';
import '@fontsource/noto-sans-thai/700.css';
import './index.css';

import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from '@/app/app';

const rootElement = document.getElementById('root');
if (!rootElement) throw new Error('index.html has no #root element.');

createRoot(rootElement).render(
  <StrictMode>
    <App />
  </StrictMode>,
);

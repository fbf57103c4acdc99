import '@fontsource/inter/400.css';
import '@fontsource/inter/500.css';
import '@fontsource/inter/600.css';
import '@fontsource/inter/700.css';
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

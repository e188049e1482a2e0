import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// Fonts ship with the app (no third-party font host): regular, semibold and bold only.
import '@fontsource/nunito-sans/400.css';
import '@fontsource/nunito-sans/600.css';
import '@fontsource/nunito-sans/700.css';
import './styles.css';
import { Providers } from './providers.tsx';

const root = document.getElementById('root');
if (!root) throw new Error('index.html must contain <div id="root">');

createRoot(root).render(
  <StrictMode>
    <Providers />
  </StrictMode>,
);

import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// Fonts ship with the app (no third-party font host): regular, semibold and bold only.
import '@fontsource/nunito-sans/400.css';
import '@fontsource/nunito-sans/600.css';
import '@fontsource/nunito-sans/700.css';
import './styles.css';
import { Providers } from './providers.tsx';

// A page restored from the back/forward cache shows what was on screen when it was left, without
// asking the server. On a tablet lent for signing that could be a staff page, so a restored page
// always loads afresh and the server decides what it may show.
window.addEventListener('pageshow', (event) => {
  if (event.persisted) window.location.reload();
});

const root = document.getElementById('root');
if (!root) throw new Error('index.html must contain <div id="root">');

createRoot(root).render(
  <StrictMode>
    <Providers />
  </StrictMode>,
);

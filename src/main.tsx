import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import './index.css';
import { AppProvider } from './app/provider';

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider />
  </StrictMode>,
);

// The service worker (built by vite-plugin-pwa) lets the app open offline after one online visit. Only in
// production builds: under `vite dev` it would serve stale modules. Service workers need a secure context
// (HTTPS or localhost); over plain HTTP the app simply works online only.
if (import.meta.env.PROD && 'serviceWorker' in navigator && window.isSecureContext) {
  window.addEventListener('load', () => {
    navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => {
      /* no offline shell this time; everything else works */
    });
  });
}

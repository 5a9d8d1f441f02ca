import '@fontsource-variable/ibm-plex-sans';
import '@fontsource/ibm-plex-mono/400.css';
import '@fontsource/ibm-plex-mono/600.css';
import './index.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './app/app';
import { refreshCsrfToken } from './lib/api-client';

const root = document.getElementById('root');
if (!root) throw new Error('index.html has no #root element');

// The token is fetched once at load so the first form submission does not wait for it; failures surface on that submission.
refreshCsrfToken().catch(() => undefined);

createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);

import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// Shipped with the app: the weights the interface uses, nothing fetched from elsewhere.
import '@fontsource/source-sans-3/400.css';
import '@fontsource/source-sans-3/600.css';
import '@fontsource/source-sans-3/700.css';
import './index.css';
import { AppProvider } from './app/provider';
import { AppRouter, warmPageCode } from './app/router';

const container = document.getElementById('root');
if (!container) throw new Error('The page has no #root element to mount the app into.');

createRoot(container).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
    </AppProvider>
  </StrictMode>,
);

// Once the first page is up and the browser has nothing else to do, the code of the pages people
// move between all day is fetched (a browser without idle callbacks waits two seconds instead).
if ('requestIdleCallback' in window) window.requestIdleCallback(warmPageCode, { timeout: 5000 });
else setTimeout(warmPageCode, 2000);

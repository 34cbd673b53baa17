import '@fontsource/atkinson-hyperlegible/400.css';
import '@fontsource/atkinson-hyperlegible/700.css';
import './styles.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { AppProviders } from './app/providers';
import { router } from './app/router';
import { onlineStatus } from './lib/online-status';
import { connectOnlineManager } from './lib/query-client';
import { registerServiceWorker } from './lib/service-worker';
import { applyTheme } from './lib/theme';

// Before the first render, so hall mode never flashes light in a dark vault.
applyTheme();
connectOnlineManager();
onlineStatus.start();

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');
createRoot(container).render(
  <StrictMode>
    <AppProviders>
      <RouterProvider router={router} />
    </AppProviders>
  </StrictMode>,
);

if (import.meta.env.PROD) registerServiceWorker();

import './fonts.css';
import './styles.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App, createApp, whenRouterReady } from './app/provider';

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

const parts = createApp();
// The server may have sent the top of the page ready-made (a report's grade): keep it on screen
// until the app can draw the whole page, instead of swapping it for a loading screen.
if (container.hasAttribute('data-first-view')) await whenRouterReady(parts);

createRoot(container).render(
  <StrictMode>
    <App parts={parts} />
  </StrictMode>,
);

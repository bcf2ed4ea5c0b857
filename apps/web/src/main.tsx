import './fonts.css';
import './styles.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App, createApp, whenRouterReady } from './app/provider';

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

const parts = createApp();
/** The weights the app uses; a font that fails to load must not keep the app from starting. */
const interLoaded = () =>
  Promise.all(['400', '500', '600', '700'].map((weight) => document.fonts.load(`${weight} 1em Inter`))).catch(() => []);
// The server may have sent the top of the page ready-made (a report's grade): keep it on screen
// until the app can draw the whole page, instead of swapping it for a loading screen, and until
// the web font is in, so the app's text comes out the same size as the text it replaces.
if (container.hasAttribute('data-first-view')) await Promise.all([whenRouterReady(parts), interLoaded()]);

createRoot(container).render(
  <StrictMode>
    <App parts={parts} />
  </StrictMode>,
);

// Entry point: open the setup from the link (or the default), start the URL sync and the tracker, render,
// and register the offline cache in production builds.
import { createRoot } from 'react-dom/client';
import { App } from './App.tsx';
import { startRunner } from './runner.ts';
import { openFromLocation, startUrlSync } from './urlSync.ts';
import './styles.css';

openFromLocation();
startUrlSync();
startRunner();
createRoot(document.getElementById('root')!).render(<App />);

if (import.meta.env.PROD && 'serviceWorker' in navigator) {
  // Relative URL: the app may be served from any sub-path.
  navigator.serviceWorker.register('./sw.js').catch((e: unknown) => console.warn('offline cache not available:', e));
}

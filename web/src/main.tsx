/** Entry point: theme first (no flash of the wrong theme), then the session, then the app. */
import { render } from 'preact';
import { App } from './app.tsx';
import { applyTheme, prefs } from './prefs.ts';
import { registerServiceWorker } from './offline.ts';
import { loadSession } from './session.ts';
import './styles.css';

applyTheme(prefs.get().theme);
matchMedia('(prefers-color-scheme: dark)').addEventListener('change', () => applyTheme(prefs.get().theme));
registerServiceWorker();
void loadSession();
render(<App />, document.getElementById('app')!);

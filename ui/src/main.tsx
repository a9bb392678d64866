import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { FocusStyleManager } from '@blueprintjs/core';
// fonts are bundled from @fontsource: nothing is fetched from a font CDN
import '@fontsource/merriweather/400.css';
import '@fontsource/merriweather/700.css';
import '@fontsource/source-sans-3/400.css';
import '@fontsource/source-sans-3/600.css';
import '@fontsource/source-sans-3/700.css';
import '@blueprintjs/core/lib/css/blueprint.css';
import '@blueprintjs/icons/lib/css/blueprint-icons.css';
import '@blueprintjs/table/lib/css/table.css';
import './styles/theme.css';
import { App } from './App';

// focus rings for keyboard users only; a mouse click does not leave a ring behind
FocusStyleManager.onlyShowFocusOnTabs();

const root = document.getElementById('root');
if (!root) throw new Error('The page has no #root element; the UI cannot start.');
createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);

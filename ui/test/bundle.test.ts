// The built UI must work offline on a lab's server: fonts and styles ship inside ui/dist, and
// nothing is fetched from another origin (no font CDN, no remote stylesheet or script).
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const DIST = join(__dirname, '..', 'dist');

function distFiles(): string[] {
  if (!existsSync(join(DIST, 'index.html')))
    throw new Error('ui/dist is missing: build the UI first with `npm run build -w ui`.');
  return readdirSync(join(DIST, 'assets'));
}

test('the heading and UI fonts are bundled as files', () => {
  const files = distFiles();
  expect(files.some((f) => /^merriweather-latin-700-normal.*\.woff2$/.test(f))).toBe(true);
  expect(files.some((f) => /^source-sans-3-latin-400-normal.*\.woff2$/.test(f))).toBe(true);
});

test('no stylesheet, script or font is loaded from another origin', () => {
  const files = distFiles();
  const html = readFileSync(join(DIST, 'index.html'), 'utf8');
  expect(html).not.toMatch(/(src|href)="(https?:)?\/\//);
  for (const css of files.filter((f) => f.endsWith('.css'))) {
    const text = readFileSync(join(DIST, 'assets', css), 'utf8');
    expect(text).not.toMatch(/url\(\s*['"]?(https?:)?\/\//);
    expect(text).not.toMatch(/@import\s+(url\()?\s*['"]?(https?:)?\/\//);
  }
  for (const js of files.filter((f) => f.endsWith('.js'))) {
    const text = readFileSync(join(DIST, 'assets', js), 'utf8');
    expect(text).not.toMatch(/fonts\.(googleapis|gstatic)\.com|cdn\.jsdelivr|unpkg\.com/);
  }
});

// Worker thread that owns Vega and Vega-Lite (ES modules with top-level await, which the
// CommonJS service and jest's module sandbox cannot import). Plain JavaScript on purpose: the
// same file runs from src/ under jest and from dist/ in production (the build copies it).
// Message in: { id, spec (Vega-Lite) }; message out: { id, svg } or { id, error }.
import { parentPort, workerData } from 'node:worker_threads';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);
const fontkit = require('fontkit');
const vega = await import('vega');
const vl = await import('vega-lite');

const fonts = new Map();
for (const f of workerData.fonts) fonts.set(f.family, fontkit.openSync(f.file));
const order = workerData.fonts.map((f) => f.family);

const familyCache = new Map();
function familiesFor(fontSpec) {
  let list = familyCache.get(fontSpec);
  if (!list) {
    const primary = String(fontSpec || order[0])
      .split(',')[0]
      .trim()
      .replace(/^["']|["']$/g, '');
    list = [primary, ...order.filter((x) => x !== primary)].filter((x) => fonts.has(x));
    familyCache.set(fontSpec, list);
  }
  return list;
}

const advanceCache = new Map();
// Advance width in em of one character in the first font (element's own, then fallbacks) that has it
function advanceEm(families, cp) {
  const key = families[0] + ':' + cp;
  let w = advanceCache.get(key);
  if (w === undefined) {
    w = 0.5;
    for (const fam of families) {
      const font = fonts.get(fam);
      if (font.hasGlyphForCodePoint(cp)) {
        w = font.glyphForCodePoint(cp).advanceWidth / font.unitsPerEm;
        break;
      }
    }
    advanceCache.set(key, w);
  }
  return w;
}

// Real metrics from the shipped font files instead of Vega's canvas-less estimate
vega.textMetrics.width = (item, text) => {
  const s = text == null ? '' : String(text);
  const size = item.fontSize != null ? +item.fontSize : 11;
  const families = familiesFor(item.font);
  let em = 0;
  for (const ch of s) em += advanceEm(families, ch.codePointAt(0));
  return em * size;
};

parentPort.on('message', async (msg) => {
  try {
    const compiled = vl.compile(msg.spec).spec;
    vega.resetSVGDefIds();
    const view = new vega.View(vega.parse(compiled), { renderer: 'none', logLevel: vega.Error });
    await view.runAsync();
    const svg = await view.toSVG();
    view.finalize();
    parentPort.postMessage({ id: msg.id, svg });
  } catch (e) {
    parentPort.postMessage({ id: msg.id, error: e && e.message ? e.message : String(e) });
  }
});
parentPort.postMessage({ ready: true });

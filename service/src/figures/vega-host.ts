/**
 * Runs Vega in a worker thread (see vega-worker.mjs for why) and hands back SVG strings.
 * One worker per host; requests are answered in order of their ids.
 */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { FIGURE_FONTS } from './fonts.js';

type Pending = { resolve: (svg: string) => void; reject: (e: Error) => void };

export class VegaHost {
  private worker: Worker | null = null;
  private ready: Promise<void> | null = null;
  private nextId = 1;
  private pending = new Map<number, Pending>();

  private start(): Promise<void> {
    if (this.ready) return this.ready;
    const worker = new Worker(join(dirname(fileURLToPath(import.meta.url)), 'vega-worker.mjs'), {
      workerData: { fonts: FIGURE_FONTS.map((f) => ({ family: f.family, file: f.file })) },
    });
    this.worker = worker;
    this.ready = new Promise<void>((resolve, reject) => {
      worker.on(
        'message',
        (msg: { ready?: boolean; id?: number; svg?: string; error?: string }) => {
          if (msg.ready) return resolve();
          const p = this.pending.get(msg.id ?? -1);
          if (!p) return;
          this.pending.delete(msg.id!);
          if (msg.error !== undefined)
            p.reject(
              new Error(`The figure could not be drawn: ${msg.error}. Check the template's spec.`),
            );
          else p.resolve(msg.svg!);
        },
      );
      worker.on('error', (e) => {
        reject(e);
        for (const p of this.pending.values()) p.reject(e);
        this.pending.clear();
      });
    });
    return this.ready;
  }

  /** Vega-Lite spec → SVG text. */
  async render(spec: unknown): Promise<string> {
    await this.start();
    const id = this.nextId++;
    return new Promise<string>((resolve, reject) => {
      this.pending.set(id, { resolve, reject });
      this.worker!.ref();
      this.worker!.postMessage({ id, spec });
    });
  }

  async close(): Promise<void> {
    const w = this.worker;
    this.worker = null;
    this.ready = null;
    if (w) await w.terminate();
  }
}

let shared: VegaHost | null = null;
/** One host per process. */
export function sharedVegaHost(): VegaHost {
  if (!shared) shared = new VegaHost();
  return shared;
}

/** Node's zlib as the engine's gunzip (Node edge only): native speed, same size ceiling. */
import { gunzipSync } from 'node:zlib';
import { GunzipTooLarge } from '../io/gzip';
import type { GunzipFunction } from '../io/gzip';

export const nodeGunzip: GunzipFunction = (bytes, maxBytes) => {
  try {
    // maxOutputLength makes zlib stop (RangeError ERR_BUFFER_TOO_LARGE) instead of inflating a bomb
    return gunzipSync(bytes, { maxOutputLength: Math.min(maxBytes + 1, 2 ** 32) });
  } catch (e) {
    if ((e as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE') throw new GunzipTooLarge();
    throw e;
  }
};

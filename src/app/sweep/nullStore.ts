/**
 * The checkpoint of the no-moon calibration sets: each chunk of realizations
 * the workers return is saved at once under `<out>/.moonsieve-nullsets/`,
 * one file per chunk, so a resumed sweep reads back what was computed
 * instead of computing it again, and repeated short interruptions still make
 * progress. A chunk is named by the SHA-256 of its class key (seed, count and
 * the moon-less scenario: nullSet.ts) and its range; its realizations are
 * seeded by (seed, class, realization) alone, so a chunk read back is the
 * same numbers a fresh computation gives (the results stay byte-identical).
 *
 * File: little-endian float64 values [n, bins, rhoBins, ttv(n), tdv(n), x0S(n),
 * binS(n), sigma(n), binOffset(n + 1), sum(bins), count(bins),
 * rho(n·rhoBins)], then the
 * SHA-256 of the class key's hash and those bytes; written atomically. A file
 * whose length or digest does not match is ignored (its range is recomputed).
 */
import { createHash } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomic } from '../../io/atomicWrite.js';
import type { PackedNullRange } from '../../sweep/nullSet.js';

export interface NullStore {
  /** Stored ranges of class `key` (of `count` realizations), not overlapping, by start. */
  load(key: string, count: number): PackedNullRange[];
  save(key: string, range: PackedNullRange): void;
  /** Forget class `key` (its cells are done). */
  drop(key: string): void;
}

function keyHash(key: string): string {
  return createHash('sha256').update(key).digest('hex');
}

function digest(hash: string, payload: Uint8Array): Buffer {
  return createHash('sha256').update(hash).update(payload).digest();
}

function encode(hash: string, r: PackedNullRange): Buffer {
  const n = r.n;
  const bins = r.binOffset[n];
  const out = new Float64Array(3 + 5 * n + (n + 1) + 2 * bins + n * r.rhoBins);
  out[0] = n;
  out[1] = bins;
  out[2] = r.rhoBins;
  let at = 3;
  for (const a of [r.ttv, r.tdv, r.x0S, r.binS, r.sigma, r.binOffset, r.sum, r.count, r.rho]) {
    out.set(a, at);
    at += a.length;
  }
  const payload = Buffer.from(out.buffer, out.byteOffset, out.byteLength);
  return Buffer.concat([payload, digest(hash, payload)]);
}

function decode(hash: string, file: Buffer, start: number): PackedNullRange | null {
  if (file.byteLength < 48) return null;
  const buf = file.subarray(0, file.byteLength - 32);
  if (buf.byteLength % 8 !== 0 || !digest(hash, buf).equals(file.subarray(file.byteLength - 32))) return null;
  const all = new Float64Array(buf.byteLength / 8);
  new Uint8Array(all.buffer).set(buf);
  const n = all[0];
  const bins = all[1];
  const rhoBins = all[2];
  if (!Number.isInteger(n) || !Number.isInteger(bins) || !Number.isInteger(rhoBins) || n < 1 || bins < 0 || rhoBins < 0) return null;
  if (all.length !== 3 + 5 * n + (n + 1) + 2 * bins + n * rhoBins) return null;
  let at = 3;
  const take = (len: number): Float64Array => {
    const a = all.slice(at, at + len);
    at += len;
    return a;
  };
  const r: PackedNullRange = {
    start, n,
    ttv: take(n), tdv: take(n), x0S: take(n), binS: take(n), sigma: take(n), binOffset: take(n + 1), sum: take(bins), count: take(bins),
    rho: take(n * rhoBins), rhoBins,
  };
  return r.binOffset[n] === bins ? r : null;
}

/** The store in folder `dir` (made on the first save). */
export function openNullStore(dir: string): NullStore {
  const list = (hash: string): Array<{ file: string; start: number; n: number }> => {
    let names: string[];
    try {
      names = readdirSync(dir);
    } catch {
      return [];
    }
    const out: Array<{ file: string; start: number; n: number }> = [];
    for (const name of names) {
      const m = /^([0-9a-f]{64})-(\d+)-(\d+)\.bin$/.exec(name);
      if (m && m[1] === hash) out.push({ file: name, start: Number(m[2]), n: Number(m[3]) });
    }
    return out.sort((a, b) => a.start - b.start || b.n - a.n);
  };
  return {
    load(key, count) {
      const out: PackedNullRange[] = [];
      let end = 0;
      const hash = keyHash(key);
      for (const e of list(hash)) {
        if (e.start < end || e.n < 1 || e.start + e.n > count) continue;
        let buf: Buffer;
        try {
          buf = readFileSync(join(dir, e.file));
        } catch {
          continue;
        }
        const r = decode(hash, buf, e.start);
        if (r === null || r.n !== e.n) continue;
        out.push(r);
        end = e.start + e.n;
      }
      return out;
    },
    save(key, range) {
      mkdirSync(dir, { recursive: true });
      const hash = keyHash(key);
      writeFileAtomic(join(dir, `${hash}-${range.start}-${range.n}.bin`), encode(hash, range));
    },
    drop(key) {
      for (const e of list(keyHash(key))) rmSync(join(dir, e.file), { force: true });
    },
  };
}

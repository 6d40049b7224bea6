/**
 * A set of 52-bit row fingerprints in one Float64Array (open addressing, linear probing): the
 * in-file duplicate check of a million-row import costs about 16 MB instead of a JavaScript
 * Set's ~50 MB of boxed numbers. Fingerprints come from fingerprint52; 0 is reserved as "empty".
 */
export class FingerprintSet {
  private table = new Float64Array(1 << 16);
  private count = 0;

  /** Adds a fingerprint; returns false when it was already there. */
  add(fp: number): boolean {
    const key = fp === 0 ? 1 : fp;
    if ((this.count + 1) * 2 > this.table.length) this.grow();
    const mask = this.table.length - 1;
    let i = (key % 0x40000000) & mask;
    for (;;) {
      const slot = this.table[i] as number;
      if (slot === 0) {
        this.table[i] = key;
        this.count++;
        return true;
      }
      if (slot === key) return false;
      i = (i + 1) & mask;
    }
  }

  get size(): number {
    return this.count;
  }

  private grow(): void {
    const old = this.table;
    this.table = new Float64Array(old.length * 2);
    this.count = 0;
    for (const v of old) if (v !== 0) this.add(v);
  }
}

/** 52-bit hash of a string (two 32-bit FNV-1a-style lanes): collisions are ~1 in 10^9 at 10^6 rows. */
export function fingerprint52(s: string): number {
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    h1 = Math.imul(h1 ^ c, 0x01000193) >>> 0;
    h2 = Math.imul(h2 ^ c, 0x5bd1e995) >>> 0;
  }
  return h1 * 0x100000 + (h2 & 0xfffff);
}

/**
 * A small bounded cache (least recently used out first) for parsed rules, compiled rule machines
 * and rejection probabilities. Values are exact results for their key, so a hit returns the very
 * number a cold computation would: caching changes the speed, never the answer.
 */
export class BoundedCache<K, V> {
  private readonly map = new Map<K, V>();

  constructor(readonly capacity: number) {}

  get(key: K): V | undefined {
    const v = this.map.get(key);
    if (v !== undefined) {
      this.map.delete(key);
      this.map.set(key, v);
    }
    return v;
  }

  set(key: K, value: V): void {
    if (this.map.has(key)) this.map.delete(key);
    else if (this.map.size >= this.capacity) {
      const oldest = this.map.keys().next();
      if (!oldest.done) this.map.delete(oldest.value);
    }
    this.map.set(key, value);
  }

  get size(): number {
    return this.map.size;
  }

  clear(): void {
    this.map.clear();
  }
}

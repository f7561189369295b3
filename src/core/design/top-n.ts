/**
 * Keeps the best `capacity` items seen so far under a total order (a binary
 * max-heap on "worse"), so a search can ask in O(1) how good a newcomer must be.
 */
export class TopN<T> {
  private readonly items: T[] = [];

  /** `worse(a, b)` is true when a ranks below b. */
  constructor(
    readonly capacity: number,
    private readonly worse: (a: T, b: T) => boolean,
  ) {}

  get size(): number {
    return this.items.length;
  }

  get full(): boolean {
    return this.items.length >= this.capacity;
  }

  /** The item that would be evicted next (the worst kept), if any. */
  peekWorst(): T | undefined {
    return this.items[0];
  }

  /** Offers an item; returns true when it was kept. */
  offer(item: T): boolean {
    const h = this.items;
    if (h.length < this.capacity) {
      h.push(item);
      this.up(h.length - 1);
      return true;
    }
    if (this.capacity === 0 || !this.worse(h[0], item)) return false;
    h[0] = item;
    this.down(0);
    return true;
  }

  /** Kept items, best first. */
  sorted(): T[] {
    return [...this.items].sort((a, b) => (this.worse(a, b) ? 1 : this.worse(b, a) ? -1 : 0));
  }

  private up(i: number): void {
    const h = this.items;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (!this.worse(h[i], h[parent])) break;
      [h[i], h[parent]] = [h[parent], h[i]];
      i = parent;
    }
  }

  private down(i: number): void {
    const h = this.items;
    for (;;) {
      const l = 2 * i + 1;
      const r = l + 1;
      let m = i;
      if (l < h.length && this.worse(h[l], h[m])) m = l;
      if (r < h.length && this.worse(h[r], h[m])) m = r;
      if (m === i) return;
      [h[i], h[m]] = [h[m], h[i]];
      i = m;
    }
  }
}

/** A typed array that grows by doubling, so reading a log costs no per-row allocation. */
class Growable<A extends Float64Array | Int32Array> {
  private buf: A;
  length = 0;
  constructor(private readonly make: (n: number) => A, capacity = 1024) {
    this.buf = make(capacity);
  }
  push(v: number): void {
    if (this.length === this.buf.length) {
      const next = this.make(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = v;
  }
  /** A copy trimmed to the used length. */
  toArray(): A {
    return this.buf.slice(0, this.length) as A;
  }
}

export class GrowableF64 extends Growable<Float64Array> {
  constructor(capacity = 1024) {
    super((n) => new Float64Array(n), capacity);
  }
}

export class GrowableI32 extends Growable<Int32Array> {
  constructor(capacity = 1024) {
    super((n) => new Int32Array(n), capacity);
  }
}

/** A Float64Array that grows by doubling, so reading a log costs no per-row allocation. */
export class GrowableF64 {
  private buf: Float64Array;
  length = 0;
  constructor(capacity = 1024) {
    this.buf = new Float64Array(capacity);
  }
  push(v: number): void {
    if (this.length === this.buf.length) {
      const next = new Float64Array(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = v;
  }
  /** A copy trimmed to the used length. */
  toArray(): Float64Array {
    return this.buf.slice(0, this.length);
  }
}

export class GrowableI32 {
  private buf: Int32Array;
  length = 0;
  constructor(capacity = 1024) {
    this.buf = new Int32Array(capacity);
  }
  push(v: number): void {
    if (this.length === this.buf.length) {
      const next = new Int32Array(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = v;
  }
  toArray(): Int32Array {
    return this.buf.slice(0, this.length);
  }
}

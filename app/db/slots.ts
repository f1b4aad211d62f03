/**
 * A counting semaphore with a bounded wait: at most `size` holders at once; a caller that cannot get a slot within
 * its timeout is refused (the error comes from `onTimeout`) and leaves the queue. Waiters are served first come,
 * first served. Used for the pool's transaction slots (client.server.ts).
 */
export class TransactionSlots {
  private held = 0;
  private readonly waiting: { grant: () => void }[] = [];

  constructor(readonly size: number) {}

  get inUse(): number {
    return this.held;
  }

  get queued(): number {
    return this.waiting.length;
  }

  acquire(timeoutMs: number, onTimeout: (waitedMs: number) => Error = defaultTimeout): Promise<() => void> {
    if (this.held < this.size) {
      this.held += 1;
      return Promise.resolve(this.releaser());
    }
    return new Promise((resolve, reject) => {
      const waiter = {
        grant: () => {
          clearTimeout(timer);
          this.held += 1;
          resolve(this.releaser());
        },
      };
      const timer = setTimeout(() => {
        const i = this.waiting.indexOf(waiter);
        if (i >= 0) this.waiting.splice(i, 1);
        reject(onTimeout(timeoutMs));
      }, timeoutMs);
      this.waiting.push(waiter);
    });
  }

  private releaser(): () => void {
    let done = false;
    return () => {
      if (done) return;
      done = true;
      this.held -= 1;
      this.waiting.shift()?.grant();
    };
  }
}

function defaultTimeout(waitedMs: number): Error {
  return new Error(`no slot became free within ${waitedMs} ms`);
}

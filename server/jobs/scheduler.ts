/**
 * Who runs next. Each person has a first-in-first-out queue; a free worker goes to the person served least
 * recently (ties: whose first job has waited longest), so one person's long queue costs anyone else at most
 * the wait for one running job. Knows nothing of workers or the database.
 */
export interface FairQueueLimits {
  /** Jobs that may run at once, over everyone. */
  threads: number;
  /** Jobs of one person that may run at once. */
  perUserRunning: number;
}

export interface QueuedJob<T> {
  id: string;
  userId: string;
  /** Milliseconds since the epoch. */
  queuedAt: number;
  item: T;
}

interface Person<T> {
  queue: (QueuedJob<T> & { arrival: number })[];
  running: number;
  /** Turn at which this person last got a worker; 0 = not yet. */
  lastServed: number;
}

export class FairQueue<T> {
  private readonly people = new Map<string, Person<T>>();
  private runningTotal = 0;
  private turn = 0;
  private arrivals = 0;

  constructor(private readonly limits: FairQueueLimits) {}

  queuedBy(userId: string): number {
    return this.people.get(userId)?.queue.length ?? 0;
  }

  runningBy(userId: string): number {
    return this.people.get(userId)?.running ?? 0;
  }

  get running(): number {
    return this.runningTotal;
  }

  get queued(): number {
    let total = 0;
    for (const person of this.people.values()) total += person.queue.length;
    return total;
  }

  enqueue(job: QueuedJob<T>): void {
    this.personOf(job.userId).queue.push({ ...job, arrival: (this.arrivals += 1) });
  }

  /** The next job to give a free worker (now counted as running), or null when no worker is free or nobody may start. */
  take(): QueuedJob<T> | null {
    if (this.runningTotal >= this.limits.threads) return null;
    const next = pickPerson([...this.people.values()].filter((person) => person.running < this.limits.perUserRunning));
    if (!next) return null;
    const { arrival: _arrival, ...job } = next.queue.shift()!;
    next.running += 1;
    next.lastServed = this.turn += 1;
    this.runningTotal += 1;
    return job;
  }

  /** A job handed out by take() has ended (any way). */
  finished(userId: string): void {
    const person = this.people.get(userId);
    if (!person || person.running === 0) return;
    person.running -= 1;
    this.runningTotal -= 1;
    this.forgetIfIdle(userId, person);
  }

  /** Takes a job that has not started out of the queue; null when it is not waiting here. */
  remove(id: string): QueuedJob<T> | null {
    for (const [userId, person] of this.people) {
      const index = person.queue.findIndex((job) => job.id === id);
      if (index < 0) continue;
      const [{ arrival: _arrival, ...job }] = person.queue.splice(index, 1);
      this.forgetIfIdle(userId, person);
      return job;
    }
    return null;
  }

  find(id: string): QueuedJob<T> | null {
    for (const person of this.people.values()) {
      const job = person.queue.find((queued) => queued.id === id);
      if (job) return job;
    }
    return null;
  }

  /** How many waiting jobs get a worker before this one, taking turns as take() does; null when it is not waiting. */
  ahead(id: string): number | null {
    if (!this.find(id)) return null;
    const replay = [...this.people.values()].map((person) => ({ queue: [...person.queue], running: 0, lastServed: person.lastServed }));
    let turn = this.turn;
    for (let count = 0; ; count += 1) {
      const next = pickPerson(replay)!;
      if (next.queue.shift()!.id === id) return count;
      next.lastServed = turn += 1;
    }
  }

  private personOf(userId: string): Person<T> {
    let person = this.people.get(userId);
    if (!person) {
      person = { queue: [], running: 0, lastServed: 0 };
      this.people.set(userId, person);
    }
    return person;
  }

  private forgetIfIdle(userId: string, person: Person<T>) {
    if (person.queue.length === 0 && person.running === 0) this.people.delete(userId);
  }
}

/** Least recently served first; among equals, whose first waiting job arrived earliest. */
function pickPerson<P extends { queue: { arrival: number }[]; lastServed: number }>(people: P[]): P | null {
  let best: P | null = null;
  for (const person of people) {
    if (!person.queue.length) continue;
    if (!best || person.lastServed < best.lastServed || (person.lastServed === best.lastServed && person.queue[0].arrival < best.queue[0].arrival)) best = person;
  }
  return best;
}

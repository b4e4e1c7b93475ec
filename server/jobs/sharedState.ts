import { randomUUID } from 'node:crypto';
import type { Logger } from 'pino';
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { ServerConfig } from '../config';
import { useSharedLimitStores } from '../http/rateLimits';
import type { Services } from '../services';
import type { LiveRelayMessage } from '../services/live';
import type { RelayedEvent } from '../services/notebookEvents';
import { redisConnection } from './queueNames';
import { createQueueRunner, type QueueStatus } from './queueRunner';
import { createWorkerPoolRunner, type JobRunner } from './runner';

/** Pub/sub channel carrying notebook changes and live-hub messages between server processes. */
const LIVE_CHANNEL = 'rungbook:live';

type Envelope = { origin: string } & ({ bus: RelayedEvent } | { hub: LiveRelayMessage });

export interface JobsStatus {
  queue: 'in-process' | QueueStatus['queue'];
  /** Worker processes on the queue, or the threads of the in-process pool. */
  workers: number;
}

/** What one server process shares with the others: the job runner, live updates, rate-limit counters. */
export interface SharedState {
  runner: JobRunner;
  /** Connect the services' event bus and live hub to the other processes (once per services). */
  attach(services: Services): void;
  status(): Promise<JobsStatus>;
  /** After services.runs.close() (which closes the runner): ends the pub/sub and rate-limit connections. */
  close(): Promise<void>;
}

const attached = new WeakMap<Services, SharedState>();

/** The shared state a server's services were attached to (health reads it), if any. */
export const sharedStateOf = (services: Services): SharedState | undefined => attached.get(services);

/**
 * Without JOB_QUEUE_URL: the in-process worker pool and nothing shared. With it: a BullMQ runner, Redis
 * stores for the rate limits (limiters created afterwards use them), and Redis pub/sub for live updates.
 * Call before createServices (senderLimit stores are made there) and createApp.
 */
export async function connectSharedState(config: ServerConfig, logger: Logger): Promise<SharedState> {
  if (!config.jobQueueUrl) return inProcessState(config);
  const url = config.jobQueueUrl;
  const origin = randomUUID();
  const [commands, publisher, subscriber] = [redisConnection(url), redisConnection(url), redisConnection(url)];
  useSharedLimitStores((prefix) => new RedisStore({ prefix, sendCommand: (command: string, ...args: string[]) => commands.call(command, ...args) as Promise<RedisReply> }));
  const runner = await createQueueRunner({ url, timeLimitMs: config.jobs.timeLimitMs, queueWaitLimitMs: config.jobs.queueWaitLimitMs, logger });
  await subscriber.subscribe(LIVE_CHANNEL);
  const send = (body: { bus: RelayedEvent } | { hub: LiveRelayMessage }) => {
    publisher.publish(LIVE_CHANNEL, JSON.stringify({ origin, ...body })).catch((error) => logger.error({ err: error }, 'publishing a live update to Redis failed'));
  };

  const state: SharedState = {
    runner,
    attach(services) {
      if (attached.has(services)) return;
      attached.set(services, state);
      services.events.relayTo((event) => send({ bus: event }));
      services.live.relayTo((message) => send({ hub: message }));
      subscriber.on('message', (_channel, text: string) => {
        const envelope = JSON.parse(text) as Envelope;
        if (envelope.origin === origin) return;
        if ('hub' in envelope) return services.live.deliver(envelope.origin, envelope.hub);
        forgetCachedCopies(services, envelope.bus);
        services.events.deliver(envelope.bus);
      });
    },
    async status() {
      const { queue, workers } = await runner.status();
      return { queue, workers };
    },
    async close() {
      useSharedLimitStores(null);
      await Promise.all([commands, publisher, subscriber].map((connection) => connection.quit().catch(() => undefined)));
    },
  };
  return state;
}

/** Another process changed the notebook: cached views of it here are out of date. */
function forgetCachedCopies(services: Services, event: RelayedEvent) {
  if ('notebookId' in event.change) services.notebooks.forget(event.change.notebookId);
}

function inProcessState(config: ServerConfig): SharedState {
  const state: SharedState = {
    runner: createWorkerPoolRunner({ threads: config.jobs.threads }),
    attach: (services) => void attached.set(services, state),
    status: async () => ({ queue: 'in-process', workers: config.jobs.threads }),
    close: async () => undefined,
  };
  return state;
}

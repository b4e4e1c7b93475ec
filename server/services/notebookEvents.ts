import { EventEmitter } from 'node:events';
import type { DataSource, EntityManager } from 'typeorm';
import type { NotebookEventKind } from '../../shared/notebook/sharing';
import { NotebookEvent } from '../db/entities';
import { newId } from '../ids';

/** Something that happened in a notebook: a line of its activity log and a live update for whoever is looking. */
export interface NotebookChange {
  notebookId: string;
  kind: NotebookEventKind;
  actorId: string | null;
  actorName: string | null;
  cellId: string | null;
  /** One line for the log, e.g. `edited cell "bubble"`. */
  text: string;
}

/** Whose access may have changed: everyone on one notebook, or one person everywhere (e.g. left a group). */
export type AccessChange = { notebookId: string } | { userId: string };

/** A change as it travels between server processes (see relayTo). */
export type RelayedEvent = { type: 'change'; change: NotebookChange } | { type: 'access'; change: AccessChange };

/**
 * Fan-out of notebook changes and access changes to the live streams. Writers record the change in their
 * transaction (recordNotebookChange) and publish it after commit. With several server processes a relay
 * (Redis pub/sub) carries what is published here to the others, which `deliver` it to their own listeners.
 */
export function createNotebookEventBus() {
  const emitter = new EventEmitter();
  emitter.setMaxListeners(0);
  const relays = new Set<(event: RelayedEvent) => void>();
  const forward = (event: RelayedEvent) => relays.forEach((send) => send(event));
  return {
    publish(change: NotebookChange): void {
      emitter.emit('change', change);
      forward({ type: 'change', change });
    },
    accessChanged(change: AccessChange): void {
      emitter.emit('access', change);
      forward({ type: 'access', change });
    },
    /** An event published by another server process: told to this process's listeners only. */
    deliver(event: RelayedEvent): void {
      emitter.emit(event.type, event.change);
    },
    /** Sends every event published here to `send` as well; returns the function that stops it. */
    relayTo(send: (event: RelayedEvent) => void): () => void {
      relays.add(send);
      return () => relays.delete(send);
    },
    onChange(listener: (change: NotebookChange) => void): () => void {
      emitter.on('change', listener);
      return () => emitter.off('change', listener);
    },
    onAccessChange(listener: (change: AccessChange) => void): () => void {
      emitter.on('access', listener);
      return () => emitter.off('access', listener);
    },
  };
}

export type NotebookEventBus = ReturnType<typeof createNotebookEventBus>;

/** Write the change to the notebook's activity log, inside the writer's transaction. */
export async function recordNotebookChange(manager: EntityManager, change: NotebookChange): Promise<void> {
  await manager.insert(NotebookEvent, { id: newId(), ...change, text: change.text.slice(0, 500) });
}

export interface CommitOptions {
  /** Also tell the live streams that who may open the notebook may have changed. */
  accessChanged?: boolean;
  /** Drop cached copies of the notebook (e.g. `notebooks.forget`) once the change is committed. */
  forget?: (notebookId: string) => void;
}

/**
 * Run `write` and record `change` in one transaction; after commit, forget cached copies, publish the
 * change and, when asked, the access change. Returns what `write` returned.
 */
export async function commitNotebookChange<T>(
  dataSource: DataSource,
  events: NotebookEventBus,
  change: NotebookChange,
  write: (manager: EntityManager) => Promise<T>,
  options: CommitOptions = {},
): Promise<T> {
  const result = await dataSource.transaction(async (manager) => {
    const written = await write(manager);
    await recordNotebookChange(manager, change);
    return written;
  });
  options.forget?.(change.notebookId);
  events.publish(change);
  if (options.accessChanged) events.accessChanged({ notebookId: change.notebookId });
  return result;
}

import type { PickedFile } from '../../hooks/api/datasets';
import { DATASET_LIMITS } from '../../shared/notebook/datasets';

/** A file the person chose: what the upload sends, and its text for the preview. */
export interface ChosenFile extends PickedFile {
  /** The bytes, read like the server reads them (a binary file is recognised as such). */
  read: () => Promise<Uint8Array>;
}

export interface FileChooserProps {
  onChosen: (file: ChosenFile) => void;
  onRefused: (message: string) => void;
  disabled?: boolean;
}

const MEGABYTE = 1024 * 1024;

/** Refused before anything is read or sent: the server would refuse it too. */
export function fileSizeProblem(name: string, bytes: number): string | null {
  if (bytes === 0) return `${name} is empty.`;
  if (bytes <= DATASET_LIMITS.maxFileBytes) return null;
  return `${name} is ${(bytes / MEGABYTE).toFixed(1)} MB; a dataset file may be at most ${DATASET_LIMITS.maxFileBytes / MEGABYTE} MB.`;
}

export const ACCEPTED_TYPES = ['text/csv', 'text/tab-separated-values', 'text/plain', '*/*'];

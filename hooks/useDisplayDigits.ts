import { useCallback, useState } from 'react';
import { DEFAULT_DISPLAY_DIGITS, DISPLAY_DIGIT_CHOICES } from '../components/notebook/displayPrecision';

/**
 * The display precision a user picked for a notebook, kept on this device: in localStorage where there is
 * one (web), else in memory for as long as the app runs (native).
 */
interface DigitStore {
  read(key: string): string | null;
  write(key: string, value: string): void;
}

const inMemory = new Map<string, string>();

function deviceStore(): DigitStore {
  try {
    const storage = globalThis.localStorage;
    if (storage) return { read: (key) => storage.getItem(key), write: (key, value) => storage.setItem(key, value) };
  } catch {
    // storage refused (private mode, sandboxed frame): keep the choice in memory
  }
  return { read: (key) => inMemory.get(key) ?? null, write: (key, value) => void inMemory.set(key, value) };
}

export const displayDigitsKey = (userId: string, notebookId: string) => `rungbook:display-digits:${userId}:${notebookId}`;

/** A stored choice that is still one of the offered ones, else the default. */
export function parseDisplayDigits(stored: string | null): number {
  const digits = Number(stored);
  return (DISPLAY_DIGIT_CHOICES as readonly number[]).includes(digits) ? digits : DEFAULT_DISPLAY_DIGITS;
}

export function readDisplayDigits(userId: string, notebookId: string): number {
  try {
    return parseDisplayDigits(deviceStore().read(displayDigitsKey(userId, notebookId)));
  } catch {
    return DEFAULT_DISPLAY_DIGITS;
  }
}

export function writeDisplayDigits(userId: string, notebookId: string, digits: number): void {
  try {
    deviceStore().write(displayDigitsKey(userId, notebookId), String(digits));
  } catch {
    // a full or refused storage only loses the choice for the next visit
  }
}

/** [digits, choose]: the user's display precision for this notebook (signed-out readers share one slot). */
export function useDisplayDigitsSetting(notebookId: string, userId: string | null | undefined): [number, (digits: number) => void] {
  const owner = userId ?? 'anonymous';
  const [choice, setChoice] = useState<{ key: string; digits: number } | null>(null);
  const key = displayDigitsKey(owner, notebookId);
  const digits = choice?.key === key ? choice.digits : readDisplayDigits(owner, notebookId);
  const choose = useCallback(
    (next: number) => {
      writeDisplayDigits(owner, notebookId, next);
      setChoice({ key: displayDigitsKey(owner, notebookId), digits: next });
    },
    [owner, notebookId],
  );
  return [digits, choose];
}

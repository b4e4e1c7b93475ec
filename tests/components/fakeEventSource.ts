import { act } from '@testing-library/react-native';
import type { LiveEvent } from '../../shared/notebook/sharing';

/** Stands in for the browser's EventSource: records what was opened and lets a test deliver events. */
export class FakeEventSource {
  static readonly CONNECTING = 0;
  static readonly OPEN = 1;
  static readonly CLOSED = 2;
  static instances: FakeEventSource[] = [];
  readyState = FakeEventSource.CONNECTING;
  onopen: (() => void) | null = null;
  onerror: (() => void) | null = null;
  private listeners = new Map<string, ((message: { data: string }) => void)[]>();
  constructor(readonly url: string, readonly init?: { withCredentials?: boolean }) {
    FakeEventSource.instances.push(this);
  }
  addEventListener(type: string, listener: (message: { data: string }) => void) {
    this.listeners.set(type, [...(this.listeners.get(type) ?? []), listener]);
  }
  close() {
    this.readyState = FakeEventSource.CLOSED;
  }
  emit(event: LiveEvent) {
    const { type, ...data } = event;
    act(() => {
      for (const listener of this.listeners.get(type) ?? []) listener({ data: JSON.stringify(data) });
    });
  }
  open() {
    this.readyState = FakeEventSource.OPEN;
    act(() => this.onopen?.());
  }
  drop() {
    this.readyState = FakeEventSource.CONNECTING;
    act(() => this.onerror?.());
  }
}

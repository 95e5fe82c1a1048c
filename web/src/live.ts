// One EventSource for the page. Views subscribe to named events while they are shown; the status
// line says whether the page is following the records live.
type Listener = (data: unknown) => void;

const listeners = new Map<string, Set<Listener>>();
let source: EventSource | undefined;

function dispatch(name: string, data: unknown): void {
  for (const fn of listeners.get(name) ?? []) fn(data);
}

export const live = {
  start(status: HTMLElement): void {
    source = new EventSource('/api/events');
    source.addEventListener('open', () => {
      status.textContent = 'live';
      status.dataset.live = 'on';
      // Anything stored while the stream was down is fetched again.
      dispatch('changed', { reconnected: true });
    });
    source.addEventListener('error', () => {
      status.textContent = 'reconnecting…';
      status.dataset.live = 'off';
    });
    for (const name of ['changed', 'drop', 'watch']) {
      source.addEventListener(name, (e) => dispatch(name, JSON.parse((e as MessageEvent<string>).data)));
    }
  },
  on(name: string, fn: Listener): () => void {
    const set = listeners.get(name) ?? new Set<Listener>();
    set.add(fn);
    listeners.set(name, set);
    return () => set.delete(fn);
  },
};

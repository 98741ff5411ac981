import type { PiniaPluginContext, StoreGeneric } from 'pinia';
import { forgetRequestsInFlight } from './latest-only';

/**
 * Gives every store, setup stores included, a `$reset()` back to the state it was created
 * with, and remembers every store so sign-out can reset them all: a later slice adding a store
 * cannot forget to take part. State must stay JSON-shaped (it is snapshotted that way).
 */
const stores = new Set<StoreGeneric>();

export function resetPlugin({ store }: PiniaPluginContext): void {
  const initial = JSON.stringify(store.$state);
  store.$reset = () => {
    const fresh = JSON.parse(initial) as Record<string, unknown>;
    store.$patch((state) => Object.assign(state, fresh));
  };
  stores.add(store);
}

/** Back to a signed-out app: every store loses what it held about the last person. */
export function resetAllStores(): void {
  forgetRequestsInFlight();
  for (const store of stores) store.$reset();
}

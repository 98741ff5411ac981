import { invalidRequest, noSuch } from './stripe-errors';
import { optionalInteger, optionalString, type Params } from './params';
import type { StripeList, StripeObject } from './stripe-objects';

/**
 * Stripe's list pages: newest first, `limit` (1–100, default 10), cursors `starting_after` and
 * `ending_before` naming an object of the list. `items` arrive oldest first (insertion order).
 */
export function listPage(items: StripeObject[], p: Params, url: string): StripeList {
  const limit = optionalInteger(p, 'limit') ?? 10;
  if (limit < 1 || limit > 100) throw invalidRequest('Invalid limit: must be between 1 and 100', { param: 'limit' });
  const newestFirst = [...items].reverse();
  const after = optionalString(p, 'starting_after');
  const before = optionalString(p, 'ending_before');
  const indexOf = (id: string, param: string) => {
    const i = newestFirst.findIndex((o) => o.id === id);
    if (i < 0) throw noSuch('object', id, param);
    return i;
  };
  if (before !== undefined) {
    const end = indexOf(before, 'ending_before');
    const start = Math.max(0, end - limit);
    return { object: 'list', data: newestFirst.slice(start, end), has_more: start > 0, url };
  }
  const start = after !== undefined ? indexOf(after, 'starting_after') + 1 : 0;
  const data = newestFirst.slice(start, start + limit);
  return { object: 'list', data, has_more: start + limit < newestFirst.length, url };
}

function cannotExpand(path: string) {
  return invalidRequest(`This property cannot be expanded (${path}).`, { param: 'expand' });
}

function expandAt(node: unknown, segments: string[], lookup: (id: string) => StripeObject | undefined, path: string): void {
  if (Array.isArray(node)) {
    for (const element of node) expandAt(element, segments, lookup, path);
    return;
  }
  if (!node || typeof node !== 'object') throw cannotExpand(path);
  const [head, ...rest] = segments;
  const obj = node as Record<string, unknown>;
  if (!(head in obj)) throw cannotExpand(path);
  let value = obj[head];
  if (typeof value === 'string') {
    const found = lookup(value);
    if (!found) throw cannotExpand(path);
    obj[head] = value = found;
  }
  if (value === null) return;
  if (rest.length) expandAt(value, rest, lookup, path);
}

/**
 * `expand[]=customer` or `expand[]=payments.data.payment.payment_intent`: ids of objects the fake
 * keeps become the objects. Fields that are already objects (lines, payments) pass as they are.
 */
export function expandObject<T>(obj: T, paths: string[], lookup: (id: string) => StripeObject | undefined): T {
  for (const path of paths) {
    const segments = path.split('.');
    if (segments.length > 4) throw invalidRequest(`You cannot expand more than 4 levels of a property (${path}).`, { param: 'expand' });
    expandAt(obj, segments, lookup, path);
  }
  return obj;
}

import type { CustomerRecord, InvoiceItemRecord, InvoiceRecord, PaymentIntentRecord, StateRecords } from './fake-state';
import type { StoredResponse } from './idempotency';
import type { DeliveryAttempt, SavedEvent, StripeEvent } from './webhook-sender';

/** Bumped when the layout changes: a file of another layout is refused, not misread. */
export const STATE_FILE_VERSION = 1;

/** The data file's JSON: everything the fake remembers, lists oldest first. */
export interface SavedState extends StateRecords {
  version: typeof STATE_FILE_VERSION;
  events: SavedEvent[];
  idempotency: Array<StoredResponse & { key: string }>;
}

/**
 * Checks of the file's shape, one per field, written out by hand (infra has no schema library).
 * `satisfies Record<keyof T, Check>` makes the compiler hold each list to its record's fields.
 */
type Check = (value: unknown, path: string) => void;

class ShapeError extends Error {}

const fail = (path: string, expected: string): never => {
  throw new ShapeError(`${path}: expected ${expected}`);
};
const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

const str: Check = (v, p) => void (typeof v === 'string' || fail(p, 'a string'));
const int: Check = (v, p) => void (Number.isSafeInteger(v) || fail(p, 'an integer'));
const bool: Check = (v, p) => void (typeof v === 'boolean' || fail(p, 'true or false'));
const anyObject: Check = (v, p) => void (isPlainObject(v) || fail(p, 'an object'));
const nullable =
  (check: Check): Check =>
  (v, p) =>
    v === null || check(v, p);
const oneOf =
  (...allowed: unknown[]): Check =>
  (v, p) =>
    void (allowed.includes(v) || fail(p, `one of ${allowed.map((a) => JSON.stringify(a)).join(', ')}`));
const mapOf =
  (check: Check): Check =>
  (v, p) => {
    if (!isPlainObject(v)) fail(p, 'an object');
    for (const [k, value] of Object.entries(v as object)) check(value, `${p}.${k}`);
  };
const listOf =
  (check: Check): Check =>
  (v, p) => {
    if (!Array.isArray(v)) fail(p, 'a list');
    (v as unknown[]).forEach((item, i) => check(item, `${p}[${i}]`));
  };
const shape =
  (fields: Record<string, Check>): Check =>
  (v, p) => {
    if (!isPlainObject(v)) fail(p, 'an object');
    for (const [k, check] of Object.entries(fields)) check((v as Record<string, unknown>)[k], `${p}.${k}`);
  };
const withId =
  (check: Check): Check =>
  (v, p) => {
    check(v, p);
    str((v as { id: unknown }).id, `${p}.id`);
  };

const metadata = mapOf(str);

const customer = shape({
  id: str,
  created: int,
  email: nullable(str),
  name: nullable(str),
  description: nullable(str),
  phone: nullable(str),
  metadata,
} satisfies Record<keyof CustomerRecord, Check>);

const invoiceItem = shape({
  id: str,
  created: int,
  customer: str,
  amount: int,
  currency: str,
  description: nullable(str),
  invoice: nullable(str),
  metadata,
} satisfies Record<keyof InvoiceItemRecord, Check>);

const invoice = shape({
  id: str,
  created: int,
  customer: str,
  currency: str,
  collection_method: oneOf('charge_automatically', 'send_invoice'),
  auto_advance: bool,
  days_until_due: nullable(int),
  due_date: nullable(int),
  description: nullable(str),
  metadata,
  status: oneOf('draft', 'open', 'paid', 'void'),
  number: nullable(str),
  finalized_at: nullable(int),
  paid_at: nullable(int),
  voided_at: nullable(int),
  attempt_count: int,
  payment_intent: nullable(str),
  invoice_payment: nullable(str),
} satisfies Record<keyof InvoiceRecord, Check>);

const paymentIntent = shape({
  id: str,
  created: int,
  amount: int,
  currency: str,
  customer: str,
  invoice: str,
  status: oneOf('requires_payment_method', 'succeeded', 'canceled'),
  client_secret: str,
  payment_method: nullable(str),
  latest_charge: nullable(str),
  last_payment_error: nullable(anyObject),
  canceled_at: nullable(int),
} satisfies Record<keyof PaymentIntentRecord, Check>);

const event = shape({
  id: str,
  object: oneOf('event'),
  api_version: str,
  created: int,
  // The object as it was when the event happened; the fake only needs its id back.
  data: shape({ object: withId(anyObject) }),
  livemode: oneOf(false),
  pending_webhooks: int,
  request: shape({ id: nullable(str), idempotency_key: nullable(str) }),
  type: str,
} satisfies Record<keyof StripeEvent, Check>);

const attempt = shape({
  delivery: int,
  attempt: int,
  at: str,
  status: nullable(int),
  error: nullable(str),
  ms: int,
} satisfies Record<keyof DeliveryAttempt, Check>);

const savedEvent = shape({ event, attempts: listOf(attempt), deliveries: int } satisfies Record<keyof SavedEvent, Check>);

const savedResponse = shape({
  key: str,
  fingerprint: str,
  endpoint: str,
  status: int,
  body: str,
} satisfies Record<keyof SavedState['idempotency'][number], Check>);

const savedState = shape({
  version: oneOf(STATE_FILE_VERSION),
  customers: listOf(customer),
  invoiceItems: listOf(invoiceItem),
  invoices: listOf(invoice),
  paymentIntents: listOf(paymentIntent),
  invoiceCounts: mapOf(int),
  events: listOf(savedEvent),
  idempotency: listOf(savedResponse),
} satisfies Record<keyof SavedState, Check>);

/** The file's text as state, or an error that says what is wrong and where. */
export function parseSavedState(text: string): SavedState {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new Error(`not valid JSON (${(e as Error).message})`);
  }
  try {
    savedState(json, '$');
  } catch (e) {
    if (e instanceof ShapeError) throw new Error(`unexpected content at ${e.message}`);
    throw e;
  }
  return json as SavedState;
}

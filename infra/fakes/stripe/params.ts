import { invalidRequest } from './stripe-errors';

/**
 * Reading form-encoded parameters (`a[b]=c`, parsed by qs) the way Stripe checks them: unknown
 * parameters, missing required ones and malformed values are 400s naming the parameter, so code
 * that would fail against Stripe fails here too.
 */
export type Params = Record<string, unknown>;

export function paramsOf(source: unknown, allowed: readonly string[]): Params {
  const params = (source && typeof source === 'object' ? source : {}) as Params;
  for (const name of Object.keys(params)) {
    if (name !== 'expand' && !allowed.includes(name)) {
      throw invalidRequest(`Received unknown parameter: ${name}`, { code: 'parameter_unknown', param: name });
    }
  }
  return params;
}

function missing(name: string) {
  return invalidRequest(`Missing required param: ${name}.`, { code: 'parameter_missing', param: name });
}

export function optionalString(p: Params, name: string): string | undefined {
  const v = p[name];
  if (v === undefined) return undefined;
  if (typeof v !== 'string') throw invalidRequest(`Invalid string: ${name} must be a string.`, { param: name });
  return v;
}

export function requiredString(p: Params, name: string): string {
  const v = optionalString(p, name);
  if (v === undefined || v === '') throw missing(name);
  return v;
}

export function optionalInteger(p: Params, name: string): number | undefined {
  const v = p[name];
  if (v === undefined) return undefined;
  if (typeof v !== 'string' || !/^-?\d{1,15}$/.test(v)) {
    throw invalidRequest(`Invalid integer: ${String(v)}`, { code: 'parameter_invalid_integer', param: name });
  }
  return Number(v);
}

export function requiredInteger(p: Params, name: string): number {
  const v = optionalInteger(p, name);
  if (v === undefined) throw missing(name);
  return v;
}

export function optionalBoolean(p: Params, name: string): boolean | undefined {
  const v = p[name];
  if (v === undefined) return undefined;
  if (v === 'true' || v === 'false') return v === 'true';
  throw invalidRequest(`Invalid boolean: ${String(v)}`, { param: name });
}

export function optionalEnum<T extends string>(p: Params, name: string, values: readonly T[]): T | undefined {
  const v = optionalString(p, name);
  if (v === undefined) return undefined;
  if (!(values as readonly string[]).includes(v)) {
    throw invalidRequest(`Invalid ${name}: must be one of ${values.join(', ')}`, { param: name });
  }
  return v as T;
}

const CURRENCIES = new Set(Intl.supportedValuesOf('currency').map((c) => c.toLowerCase()));

/** ISO 4217 codes, lower case as Stripe writes them. */
export function optionalCurrency(p: Params, name: string): string | undefined {
  const v = optionalString(p, name)?.toLowerCase();
  if (v === undefined) return undefined;
  if (!CURRENCIES.has(v)) throw invalidRequest(`Invalid currency: ${v}.`, { param: name });
  return v;
}

/**
 * Stripe's metadata rules: string values, at most 50 keys, keys up to 40 and values up to 500
 * characters. An empty value removes its key; `metadata=` (empty) removes them all.
 */
export function mergedMetadata(p: Params, current: Record<string, string> = {}): Record<string, string> {
  const v = p.metadata;
  if (v === undefined) return current;
  if (v === '') return {};
  if (!v || typeof v !== 'object' || Array.isArray(v)) throw invalidRequest('Invalid metadata: must be an object.', { param: 'metadata' });
  const out = { ...current };
  for (const [key, value] of Object.entries(v)) {
    if (typeof value !== 'string') throw invalidRequest(`Invalid metadata[${key}]: values must be strings.`, { param: `metadata[${key}]` });
    if (key.length > 40) throw invalidRequest(`Metadata keys can be at most 40 characters: ${key}`, { param: `metadata[${key}]` });
    if (value.length > 500) throw invalidRequest(`Metadata values can be at most 500 characters (${key}).`, { param: `metadata[${key}]` });
    if (value === '') delete out[key];
    else out[key] = value;
  }
  if (Object.keys(out).length > 50) throw invalidRequest('Metadata can have at most 50 keys.', { param: 'metadata' });
  return out;
}

/** `expand[]=a.b` or `expand[0]=a.b`, as the SDK sends it. */
export function expandPaths(p: Params): string[] {
  const v = p.expand;
  if (v === undefined) return [];
  const list = Array.isArray(v) ? v : typeof v === 'object' && v ? Object.values(v) : [v];
  if (!list.every((x) => typeof x === 'string')) throw invalidRequest('Invalid array: expand must list strings.', { param: 'expand' });
  return list as string[];
}

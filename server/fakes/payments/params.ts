import { errors } from './errors';

// The SDK sends form-encoded bodies (`metadata[k]=v`, `expand[0]=customer`) and query strings in the same shape;
// the qs parser behind Express's "extended" mode turns them into nested objects of strings. Every endpoint reads
// its parameters through one Params so a misspelt or unsupported parameter is refused as the API refuses it
// ("Received unknown parameter: …") instead of being ignored.

type Raw = Record<string, unknown>;

const INT = /^-?\d+$/;

export class Params {
  private readonly used = new Set<string>();

  constructor(private readonly raw: Raw) {}

  private take(name: string): unknown {
    this.used.add(name);
    const v = this.raw[name];
    return v === '' ? undefined : v;
  }

  string(name: string): string | undefined {
    const v = this.take(name);
    if (v === undefined) return undefined;
    if (typeof v !== 'string') throw errors.invalidParam(name, `Invalid string: ${name} must be a string`);
    return v;
  }

  requiredString(name: string): string {
    const v = this.string(name);
    if (v === undefined) throw errors.missingParam(name);
    return v;
  }

  int(name: string, { min }: { min?: number } = {}): number | undefined {
    const v = this.take(name);
    if (v === undefined) return undefined;
    if (typeof v !== 'string' || !INT.test(v) || !Number.isSafeInteger(Number(v))) throw errors.invalidInteger(name, v);
    const n = Number(v);
    if (min !== undefined && n < min) throw errors.invalidParam(name, `Invalid ${name}: must be at least ${min}`);
    return n;
  }

  bool(name: string): boolean | undefined {
    const v = this.take(name);
    if (v === undefined) return undefined;
    if (v === 'true') return true;
    if (v === 'false') return false;
    throw errors.invalidParam(name, `Invalid boolean: ${String(v)}`);
  }

  oneOf<T extends string>(name: string, values: readonly T[]): T | undefined {
    const v = this.string(name);
    if (v === undefined) return undefined;
    if (!(values as readonly string[]).includes(v)) {
      throw errors.invalidParam(name, `Invalid ${name}: must be one of ${values.join(', ')}`);
    }
    return v as T;
  }

  /** Arrays arrive as `x[0]=a&x[1]=b` (an array) or, past qs's index limit, as an object keyed by index. */
  stringList(name: string): string[] | undefined {
    const v = this.take(name);
    if (v === undefined) return undefined;
    const list = Array.isArray(v) ? v : typeof v === 'object' && v !== null ? Object.values(v) : [v];
    if (!list.every((s) => typeof s === 'string')) throw errors.invalidParam(name, `Invalid array: ${name} must be a list of strings`);
    return list as string[];
  }

  /** `metadata[key]=value`: at most 50 keys, keys up to 40 characters, values up to 500 (the API's limits). */
  metadata(): Record<string, string> | undefined {
    const v = this.take('metadata');
    if (v === undefined) return undefined;
    if (typeof v !== 'object' || v === null || Array.isArray(v)) throw errors.invalidParam('metadata', 'Invalid object: metadata must be a hash of keys and values');
    const out: Record<string, string> = {};
    const entries = Object.entries(v as Raw);
    if (entries.length > 50) throw errors.invalidParam('metadata', 'You can specify up to 50 keys in metadata.');
    for (const [k, val] of entries) {
      if (typeof val !== 'string') throw errors.invalidParam(`metadata[${k}]`, 'Metadata values must be strings.');
      if (k.length > 40) throw errors.invalidParam(`metadata[${k}]`, 'Metadata keys can be at most 40 characters long.');
      if (val.length > 500) throw errors.invalidParam(`metadata[${k}]`, 'Metadata values can be at most 500 characters long.');
      if (val !== '') out[k] = val;
    }
    return out;
  }

  expand(): string[] {
    return this.stringList('expand') ?? [];
  }

  /** Call last: any parameter the endpoint did not read is unknown to it. */
  done(): void {
    for (const name of Object.keys(this.raw)) {
      if (!this.used.has(name)) throw errors.unknownParam(name);
    }
  }
}

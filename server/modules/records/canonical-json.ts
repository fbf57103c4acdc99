/**
 * Canonical JSON for signed records: object keys sorted by UTF-16 code units, no whitespace,
 * strings escaped as JSON.stringify does, arrays in their order. This is the key-ordering and
 * whitespace rule of RFC 8785 (JSON Canonicalization Scheme) for the value kinds our records
 * use; numbers are limited to safe integers so that no float formatting question arises.
 */
export type CanonicalValue = string | number | boolean | null | CanonicalValue[] | { [key: string]: CanonicalValue };

export function canonicalJson(value: CanonicalValue): string {
  if (value === null || typeof value === 'boolean' || typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'number') {
    if (!Number.isSafeInteger(value)) throw new TypeError(`A signed record holds whole numbers only; got ${value}.`);
    return String(value);
  }
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  // Default sort compares UTF-16 code units, as RFC 8785 §3.2.3 asks.
  const keys = Object.keys(value).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(value[k])}`).join(',')}}`;
}

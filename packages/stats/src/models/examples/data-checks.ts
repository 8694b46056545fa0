/** Small validators for model data: each throws an Error that names the field and the problem. */
export function requireObject(data: unknown, kind: string): Record<string, unknown> {
  if (data === null || typeof data !== "object" || Array.isArray(data)) throw new Error(`${kind}: data must be an object`);
  return data as Record<string, unknown>;
}

export function requireFiniteArray(value: unknown, field: string, kind: string, minLength = 1): number[] {
  if (!Array.isArray(value) || value.length < minLength) throw new Error(`${kind}: ${field} must be an array of at least ${minLength} numbers`);
  value.forEach((v, i) => {
    if (typeof v !== "number" || !Number.isFinite(v)) throw new Error(`${kind}: ${field}[${i}] must be a finite number, got ${String(v)}`);
  });
  return value as number[];
}

export function requirePositiveArray(value: unknown, field: string, kind: string, minLength = 1): number[] {
  const values = requireFiniteArray(value, field, kind, minLength);
  values.forEach((v, i) => {
    if (!(v > 0)) throw new Error(`${kind}: ${field}[${i}] must be positive, got ${v}`);
  });
  return values;
}

export function requireFinite(value: unknown, field: string, kind: string): number {
  if (typeof value !== "number" || !Number.isFinite(value)) throw new Error(`${kind}: ${field} must be a finite number, got ${String(value)}`);
  return value;
}

export function requirePositive(value: unknown, field: string, kind: string): number {
  const v = requireFinite(value, field, kind);
  if (!(v > 0)) throw new Error(`${kind}: ${field} must be positive, got ${v}`);
  return v;
}

export function requireInteger(value: unknown, field: string, kind: string, min: number, max: number): number {
  if (typeof value !== "number" || !Number.isInteger(value) || value < min || value > max) {
    throw new Error(`${kind}: ${field} must be an integer from ${min} to ${max}, got ${String(value)}`);
  }
  return value;
}

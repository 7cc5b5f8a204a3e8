/**
 * Applies fork overrides to a spec: nested objects merge field by field, except
 * that an object naming a new `kind` replaces the old one (its fields belong to
 * the old kind). The result still goes through the run-spec schema.
 */
export function applySpecOverrides(spec: Record<string, unknown>, overrides: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = structuredClone(spec);
  for (const [key, value] of Object.entries(overrides)) {
    const current = out[key];
    const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
    if (isObject(value) && isObject(current) && !('kind' in value && value.kind !== current.kind)) {
      out[key] = { ...current, ...value };
    } else {
      out[key] = value;
    }
  }
  return out;
}

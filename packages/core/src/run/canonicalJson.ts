import { createHash } from "node:crypto";

/**
 * JSON with object keys sorted and undefined values dropped, so that equal values give equal
 * text whatever the order their keys were written in. (Common practice, no source.)
 */
export function canonicalJson(value: unknown): string {
  const canon = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(canon);
    if (v !== null && typeof v === "object") {
      const out: Record<string, unknown> = {};
      for (const k of Object.keys(v as object).sort()) {
        const x = (v as Record<string, unknown>)[k];
        if (x !== undefined) out[k] = canon(x);
      }
      return out;
    }
    return v;
  };
  return JSON.stringify(canon(value));
}

/** SHA-256 (hex) of {@link canonicalJson}: the identity of a run, a campaign or a set of settings. */
export function canonicalHash(value: unknown): string {
  return createHash("sha256").update(canonicalJson(value)).digest("hex");
}

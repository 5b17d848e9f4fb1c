/** Paths of every number in `x` that is not finite (NaN, ±Infinity): a test helper. */
export function nonFinitePaths(x: unknown, path = '$', out: string[] = []): string[] {
  if (typeof x === 'number') {
    if (!Number.isFinite(x)) out.push(`${path} = ${x}`);
  } else if (Array.isArray(x)) {
    x.forEach((v, i) => nonFinitePaths(v, `${path}[${i}]`, out));
  } else if (x && typeof x === 'object') {
    for (const [k, v] of Object.entries(x)) nonFinitePaths(v, `${path}.${k}`, out);
  }
  return out;
}

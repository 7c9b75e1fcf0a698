/**
 * At most `maxPoints` of `samples`, evenly spaced and always with the newest:
 * a chart a few hundred pixels wide shows no more than that, and every point
 * recharts draws costs the page time while the bench runs.
 */
export function thinSamples<T>(samples: readonly T[], maxPoints: number): readonly T[] {
  if (samples.length <= maxPoints) return samples;
  const step = samples.length / maxPoints;
  const thinned: T[] = [];
  for (let i = 0; i < maxPoints - 1; i++) thinned.push(samples[Math.floor(i * step)]!);
  thinned.push(samples[samples.length - 1]!);
  return thinned;
}

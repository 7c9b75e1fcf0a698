import { performance } from "node:perf_hooks";

/**
 * Wall-clock and CPU seconds since the call. The targets are wall-clock; CPU
 * time of this process is printed beside it because the machine may be shared,
 * and other processes stretch wall time but not our CPU time.
 */
export function startClock(): () => { wallS: number; cpuS: number } {
  const wall = performance.now();
  const cpu = process.cpuUsage();
  return () => {
    const used = process.cpuUsage(cpu);
    return { wallS: (performance.now() - wall) / 1000, cpuS: (used.user + used.system) / 1e6 };
  };
}

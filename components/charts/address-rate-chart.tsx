"use client";

import { Bar, BarChart, CartesianGrid, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { AddressRateSample } from "@/components/sim/sim-protocol";

/** How many of the latest virtual seconds the rate is averaged over. */
const WINDOW_SECONDS = 10;
const MAX_ADDRESSES = 12;

/** Telegrams per second per destination address, averaged over the latest seconds, busiest first. */
export function AddressRateChart({
  samples,
  names,
}: {
  samples: readonly AddressRateSample[];
  names: Readonly<Record<string, string>>;
}) {
  const lastSecond = samples.at(-1)?.second ?? 0;
  const totals = new Map<string, number>();
  for (const sample of samples) {
    if (sample.second <= lastSecond - WINDOW_SECONDS) continue;
    for (const [address, count] of Object.entries(sample.counts))
      totals.set(address, (totals.get(address) ?? 0) + count);
  }
  const data = [...totals]
    .map(([address, total]) => ({
      address,
      name: names[address] ?? "",
      rate: Math.round((total / WINDOW_SECONDS) * 10) / 10,
    }))
    .sort((a, b) => b.rate - a.rate)
    .slice(0, MAX_ADDRESSES);
  return (
    <figure aria-label="Telegram rate per address">
      <figcaption className="mb-1 text-xs text-ink-soft">
        Telegrams per second per address, last {WINDOW_SECONDS} s
      </figcaption>
      {data.length === 0 ? (
        <p className="text-xs text-ink-soft">No telegrams yet.</p>
      ) : (
        <ResponsiveContainer width="100%" height={Math.max(80, data.length * 22 + 24)}>
          <BarChart
            data={data}
            layout="vertical"
            margin={{ top: 4, right: 16, bottom: 4, left: 0 }}
          >
            <CartesianGrid stroke="#dcd0ba" strokeDasharray="3 3" horizontal={false} />
            <XAxis type="number" fontSize={11} unit="/s" />
            <YAxis type="category" dataKey="address" fontSize={11} width={56} />
            <Tooltip
              formatter={(value) => `${value} telegrams/s`}
              labelFormatter={(address) => `${address} ${names[String(address)] ?? ""}`}
            />
            <Bar dataKey="rate" fill="#1e8377" isAnimationActive={false} />
          </BarChart>
        </ResponsiveContainer>
      )}
    </figure>
  );
}

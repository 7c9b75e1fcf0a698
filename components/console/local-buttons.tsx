"use client";

import { useSimSend } from "@/components/sim/sim-context";
import type { BenchDeviceSummary } from "@/components/sim/sim-protocol";
import { Mono } from "@/components/ui/mono";

/**
 * A device's local buttons (push-button rockers, wall controller keys, control
 * panel tiles) as a person would press them; each press goes to the worker as
 * the device's own button event, so the device decides what to send.
 */
export function LocalButtons({ device }: { device: BenchDeviceSummary }) {
  const send = useSimSend();
  return (
    <div aria-label={`Buttons of ${device.name}`} role="group">
      <p className="text-xs">
        {device.name}{" "}
        {device.individualAddress ? (
          <Mono className="text-ink-soft">{device.individualAddress}</Mono>
        ) : null}
      </p>
      {device.buttons.length === 0 ? (
        <p className="mt-1 text-xs text-ink-soft">No local buttons</p>
      ) : (
        <div className="mt-1 flex flex-wrap gap-1.5">
          {device.buttons.map((button) => (
            <button
              key={button.id}
              type="button"
              className="rounded border border-graphite-line bg-graphite px-2 py-1 text-xs text-graphite-text hover:bg-graphite-raised"
              onClick={() => send({ type: "press", deviceId: device.id, buttonId: button.id })}
            >
              {button.label}
            </button>
          ))}
        </div>
      )}
    </div>
  );
}

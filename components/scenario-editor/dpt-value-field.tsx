"use client";

import { useState } from "react";
import { getDpt, HVAC_CONTROLLER_MODES, HVAC_MODES } from "@/engine";

const inputClass = "w-full rounded-md border border-paper-line bg-white px-2 py-1.5 text-sm";

/** Whether the value is acceptable for the DPT, in the codec's own words when not. */
export function dptValueProblem(dpt: string | undefined, value: unknown): string | null {
  if (value === undefined) return null;
  const codec = dpt ? getDpt(dpt) : undefined;
  if (!codec) return null;
  const parsed = codec.valueSchema.safeParse(value);
  return parsed.success ? null : (parsed.error.issues[0]?.message ?? `not a ${dpt} value`);
}

/**
 * A value editor made for a group address's DPT: a switch for 1.x, a
 * percentage for 5.001, a number with its unit for 9.x/14.x, the mode list for
 * 20.102/20.105, a scene number for 17.001, learn + scene for 18.001, text for
 * 16.x; anything else is edited as JSON. The codec's schema checks the value.
 */
export function DptValueField({
  id,
  dpt,
  value,
  onChange,
  optional = false,
}: {
  id: string;
  dpt: string | undefined;
  value: unknown;
  onChange: (value: unknown) => void;
  optional?: boolean;
}) {
  const codec = dpt ? getDpt(dpt) : undefined;
  const problem = dptValueProblem(dpt, value);
  const family = dpt?.split(".")[0];
  let field: React.ReactNode;

  if (dpt && family === "1") {
    const [off, on] = dpt === "1.100" ? ["cooling", "heating"] : ["off / false", "on / true"];
    field = (
      <select
        id={id}
        className={inputClass}
        value={value === undefined ? "" : String(value)}
        onChange={(e) => onChange(e.target.value === "" ? undefined : e.target.value === "true")}
      >
        {optional || value === undefined ? (
          <option value="">{optional ? "any value" : "choose"}</option>
        ) : null}
        <option value="true">1 — {on}</option>
        <option value="false">0 — {off}</option>
      </select>
    );
  } else if (dpt === "20.105" || dpt === "20.102") {
    const table = dpt === "20.105" ? HVAC_CONTROLLER_MODES : HVAC_MODES;
    field = (
      <select
        id={id}
        className={inputClass}
        value={value === undefined ? "" : String(value)}
        onChange={(e) => onChange(e.target.value === "" ? undefined : Number(e.target.value))}
      >
        {optional || value === undefined ? (
          <option value="">{optional ? "any value" : "choose"}</option>
        ) : null}
        {Object.entries(table).map(([code, name]) => (
          <option key={code} value={code}>
            {code} — {name}
          </option>
        ))}
      </select>
    );
  } else if (dpt === "18.001") {
    const control = (value ?? { learn: false, scene: 1 }) as { learn?: boolean; scene?: number };
    field = (
      <span className="flex items-center gap-3">
        <label className="flex items-center gap-1 text-sm">
          <input
            type="checkbox"
            checked={control.learn === true}
            onChange={(e) => onChange({ ...control, learn: e.target.checked })}
          />
          learn
        </label>
        <input
          id={id}
          type="number"
          min={1}
          max={64}
          className={inputClass}
          value={control.scene ?? ""}
          onChange={(e) => onChange({ ...control, scene: Number(e.target.value) })}
          aria-label="scene number"
        />
      </span>
    );
  } else if (dpt && family === "16") {
    field = (
      <input
        id={id}
        className={inputClass}
        value={typeof value === "string" ? value : ""}
        maxLength={14}
        onChange={(e) => onChange(e.target.value)}
      />
    );
  } else if (
    codec &&
    ["5", "6", "7", "8", "9", "12", "13", "14", "17"].includes(family ?? "") &&
    (value === undefined || typeof value === "number")
  ) {
    const integer = family !== "9" && family !== "14" && dpt !== "5.001" && dpt !== "5.003";
    field = (
      <span className="flex items-center gap-2">
        <input
          id={id}
          type="number"
          step={integer ? 1 : "any"}
          min={codec.min}
          max={codec.max}
          className={inputClass}
          value={typeof value === "number" ? value : ""}
          onChange={(e) => onChange(e.target.value === "" ? undefined : Number(e.target.value))}
        />
        {codec.unit ? <span className="text-sm text-ink-soft">{codec.unit}</span> : null}
      </span>
    );
  } else {
    field = <JsonValueField id={id} value={value} onChange={onChange} />;
  }

  return (
    <span className="flex flex-col gap-1">
      {field}
      {codec ? (
        <span className="text-xs text-ink-soft">
          DPT {codec.id} {codec.name}
        </span>
      ) : null}
      {problem ? (
        <span role="alert" className="text-xs text-fault">
          {problem}
        </span>
      ) : null}
    </span>
  );
}

/** Any JSON value, typed as JSON text; kept as text while it does not parse. */
export function JsonValueField({
  id,
  value,
  onChange,
}: {
  id: string;
  value: unknown;
  onChange: (value: unknown) => void;
}) {
  const [text, setText] = useState(value === undefined ? "" : JSON.stringify(value));
  const [bad, setBad] = useState(false);
  return (
    <span className="flex flex-col gap-1">
      <input
        id={id}
        className={`${inputClass} font-mono`}
        value={text}
        placeholder='true, 21.5, "text" or {"scene": 2}'
        onChange={(e) => {
          setText(e.target.value);
          if (e.target.value.trim() === "") {
            setBad(false);
            onChange(undefined);
            return;
          }
          try {
            onChange(JSON.parse(e.target.value));
            setBad(false);
          } catch {
            setBad(true);
          }
        }}
      />
      {bad ? (
        <span role="alert" className="text-xs text-fault">
          not valid JSON yet
        </span>
      ) : null}
    </span>
  );
}

"use client";

import { useState } from "react";
import { editorFor } from "./dpt-value";

const inputClass =
  "rounded-md border border-paper-line bg-white px-2 py-1 font-mono text-sm text-ink";

/** An editor made for the DPT: a switch, a percent slider, a number field with its unit, a mode list, a scene number, text. */
export function ValueEditor({
  dpt,
  value,
  onChange,
}: {
  dpt: string;
  value: unknown;
  onChange: (value: unknown) => void;
}) {
  const editor = editorFor(dpt);
  switch (editor.kind) {
    case "switch":
      return (
        <div
          role="radiogroup"
          aria-label="Value"
          className="inline-flex overflow-hidden rounded-md border border-paper-line"
        >
          {[false, true].map((option) => (
            <button
              key={String(option)}
              type="button"
              role="radio"
              aria-checked={value === option}
              onClick={() => onChange(option)}
              className={
                value === option
                  ? "bg-teal px-3 py-1 text-sm text-white"
                  : "bg-white px-3 py-1 text-sm text-ink"
              }
            >
              {/* The chosen side carries a mark, not only its colour. */}
              {value === option ? <span aria-hidden="true">✓ </span> : null}
              {option ? editor.onLabel : editor.offLabel}
            </button>
          ))}
        </div>
      );
    case "percent":
      return (
        <label className="flex items-center gap-2 text-sm">
          <input
            type="range"
            min={0}
            max={100}
            step={1}
            aria-label="Value"
            value={typeof value === "number" ? value : 0}
            onChange={(e) => onChange(Number(e.target.value))}
          />
          <span className="w-12 font-mono">{typeof value === "number" ? value : 0} %</span>
        </label>
      );
    case "number":
      return (
        <NumberField
          value={value}
          min={editor.min}
          max={editor.max}
          step={editor.step}
          unit={editor.unit}
          onChange={onChange}
        />
      );
    case "mode":
      return (
        <select
          aria-label="Value"
          className={inputClass}
          value={typeof value === "number" ? value : 0}
          onChange={(e) => onChange(Number(e.target.value))}
        >
          {editor.options.map((option) => (
            <option key={option.value} value={option.value}>
              {option.value} {option.label}
            </option>
          ))}
        </select>
      );
    case "scene":
      return (
        <NumberField value={value} min={1} max={64} step={1} unit="scene" onChange={onChange} />
      );
    case "scene-control": {
      const current = (
        typeof value === "object" && value !== null ? value : { learn: false, scene: 1 }
      ) as { learn: boolean; scene: number };
      return (
        <span className="flex items-center gap-2">
          <select
            aria-label="Recall or learn"
            className={inputClass}
            value={current.learn ? "learn" : "recall"}
            onChange={(e) => onChange({ ...current, learn: e.target.value === "learn" })}
          >
            <option value="recall">recall</option>
            <option value="learn">learn</option>
          </select>
          <NumberField
            value={current.scene}
            min={1}
            max={64}
            step={1}
            unit="scene"
            onChange={(scene) => onChange({ ...current, scene })}
          />
        </span>
      );
    }
    case "text":
      return (
        <input
          aria-label="Value"
          className={inputClass}
          maxLength={editor.maxLength}
          value={typeof value === "string" ? value : ""}
          onChange={(e) => onChange(e.target.value)}
        />
      );
    case "json":
      return <JsonField value={value} onChange={onChange} />;
  }
}

function NumberField({
  value,
  min,
  max,
  step,
  unit,
  onChange,
}: {
  value: unknown;
  min: number;
  max: number;
  step: number;
  unit: string;
  onChange: (value: number) => void;
}) {
  return (
    <label className="flex items-center gap-2 text-sm">
      <input
        type="number"
        aria-label="Value"
        className={`${inputClass} w-28`}
        min={min}
        max={max}
        step={step}
        value={typeof value === "number" ? value : ""}
        onChange={(e) => onChange(e.target.value === "" ? Number.NaN : Number(e.target.value))}
      />
      {unit ? <span className="text-ink-soft">{unit}</span> : null}
    </label>
  );
}

function JsonField({ value, onChange }: { value: unknown; onChange: (value: unknown) => void }) {
  const [text, setText] = useState(() => JSON.stringify(value ?? null));
  return (
    <input
      aria-label="Value (JSON)"
      className={`${inputClass} w-56`}
      value={text}
      onChange={(e) => {
        setText(e.target.value);
        try {
          onChange(JSON.parse(e.target.value));
        } catch {
          onChange(undefined);
        }
      }}
    />
  );
}
